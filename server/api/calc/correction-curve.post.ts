import { correctionCurveSchema } from '#shared/schemas/calc'
import { correctionCurve } from '#shared/gas/charge-target'

/** POST /api/calc/correction-curve — target and band across a temperature range, for plotting. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(correctionCurveSchema))
  return runEngine(() => correctionCurve(body), 'from')
})
