import { trendQuerySchema } from '#shared/schemas/trends'
import { fleetPrechargeTrends } from '../../../services/trends'

/** Installed units ranked by pre-charge loss rate (a day, positive = losing gas), a page at a time, stored trends. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'trend.read')
  const query = await getValidatedQuery(event, validateWith(trendQuerySchema))
  return fleetPrechargeTrends(query, scope)
})
