import { aircraftQuerySchema } from '#shared/schemas/aircraft'
import { listAircraft } from '../../services/aircraft'

/** The fleet: search, filter by type, base and active, sort, pages. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(aircraftQuerySchema))
  return listAircraft(query, scope)
})
