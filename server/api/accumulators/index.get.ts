import { accumulatorQuerySchema } from '#shared/schemas/accumulators'
import { listUnits } from '../../services/accumulators'

/** Accumulators with their aircraft and current specification: search, filter, sort, pages. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(accumulatorQuerySchema))
  return listUnits(query, scope)
})
