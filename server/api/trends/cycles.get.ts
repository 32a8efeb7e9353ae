import { noQuerySchema } from '../../../shared/schemas/cycle-check'
import { cycleTrends } from '../../services/trends'

/** Pump cycle interval and leak rate per aircraft system, against the system's own baseline. Reads only. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return { items: await cycleTrends(), dropShare: Number(useRuntimeConfig().cycleDropShare) }
})
