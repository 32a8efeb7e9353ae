import { unitTrendParamsSchema } from '#shared/schemas/trends'
import { unitTrend } from '../../../services/trends'

/** One unit's readings carried to the reference temperature, the band, the fit and the flag. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'trend.read')
  const { accumulatorId } = await getValidatedRouterParams(event, validateWith(unitTrendParamsSchema))
  return unitTrend(accumulatorId, scope)
})
