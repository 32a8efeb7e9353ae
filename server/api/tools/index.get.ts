import { toolQuerySchema } from '#shared/schemas/tools'
import { listTools } from '../../services/tools'

/** Gauges and nitrogen carts with their calibration state: search, filter, sort, pages. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(toolQuerySchema))
  return listTools(query)
})
