import { leakRateSchema } from '#shared/schemas/calc'
import { leakRate } from '#shared/gas/leakage'

/** POST /api/calc/leak-rate — leak rate implied by a cut-out to cut-in interval. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(leakRateSchema))
  return runEngine(() => leakRate(body), 'temperature')
})
