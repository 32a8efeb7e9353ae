import { leakIntervalSchema } from '#shared/schemas/calc'
import { leakInterval } from '#shared/gas/leakage'

/** POST /api/calc/leak-interval — cut-out to cut-in interval implied by a leak rate. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(leakIntervalSchema))
  return runEngine(() => leakInterval(body), 'temperature')
})
