import { z } from 'zod'
import { unitTrend } from '../../../services/trends'

const paramsSchema = z.object({
  accumulatorId: z.coerce.number({ invalid_type_error: 'The id must be a number.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
})

/** One unit's readings carried to the reference temperature, the band, the fit and the flag. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'trend.read')
  const { accumulatorId } = await getValidatedRouterParams(event, validateWith(paramsSchema))
  return unitTrend(accumulatorId, scope)
})
