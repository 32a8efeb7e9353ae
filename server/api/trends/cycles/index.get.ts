import { cycleTrendQuerySchema } from '#shared/schemas/trends'
import { cycleTrendPage } from '../../../services/trends'

/**
 * Pump cycle interval and leak rate per aircraft system against the system's own baseline: one page of
 * systems (largest drop first, each with a bounded chart series) and the flagged ones. Reads only.
 */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'trend.read')
  const query = await getValidatedQuery(event, validateWith(cycleTrendQuerySchema))
  return cycleTrendPage(query, scope)
})
