import { cycleSeriesQuerySchema } from '#shared/schemas/trends'
import { systemCycleSeries } from '../../../services/trends'

/** One hydraulic system's whole series of pump-cycle checks, for its chart in full. Reads only. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'trend.read')
  const { aircraftId, system } = await getValidatedQuery(event, validateWith(cycleSeriesQuerySchema))
  return { items: await systemCycleSeries(aircraftId, system, scope) }
})
