import { optimumPrechargeSchema } from '#shared/schemas/calc'
import { optimumPrecharge } from '#shared/gas/usable-volume'

/** POST /api/calc/optimum-precharge — the pre-charge that maximises usable volume. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(optimumPrechargeSchema))
  return runEngine(() => optimumPrecharge(body), 'maxPressure')
})
