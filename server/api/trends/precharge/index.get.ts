import { trendQuerySchema } from '../../../../shared/schemas/cycle-check'
import { fleetPrechargeTrends } from '../../../services/trends'

/** Installed units ranked by pre-charge loss rate (per day, positive = losing gas), from the stored trends. Reads only. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(trendQuerySchema))
  return { items: await fleetPrechargeTrends(query) }
})
