import { noQuerySchema } from '#shared/schemas/common'
import { cycleTrends } from '../../services/trends'

/** Pump cycle interval and leak rate per aircraft system, against the system's own baseline. Reads only. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'trend.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return { items: await cycleTrends(), dropShare: Number(useRuntimeConfig().cycleDropShare) }
})
