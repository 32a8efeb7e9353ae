import { trendQuerySchema } from '#shared/schemas/trends'
import { fleetPrechargeTrends } from '../../../services/trends'

/** Installed units ranked by pre-charge loss rate (per day, positive = losing gas), from the stored trends. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'trend.read')
  const query = await getValidatedQuery(event, validateWith(trendQuerySchema))
  return { items: await fleetPrechargeTrends(query) }
})
