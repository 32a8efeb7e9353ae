import { chargeTargetSchema } from '#shared/schemas/calc'
import { chargeTarget } from '#shared/gas/charge-target'

/** POST /api/calc/charge-target — the pre-charge to hold at the gas temperature now, with the band. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(chargeTargetSchema))
  return runEngine(() => chargeTarget(body), 'gasTemperature')
})
