import { dueQuerySchema } from '#shared/schemas/due'
import { dueList } from '../../services/due'

const COLUMNS = ['dueOn', 'bucket', 'station', 'registration', 'aircraftType', 'position', 'partNumber', 'serialNumber', 'lastCheckOn', 'scheduledOn', 'broughtForward', 'reason']

/** The due list as CSV (the station's, or everyone's). */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(dueQuerySchema))
  const { items } = await dueList(query, scope)
  return sendCsv(event, `due${query.station ? `-${query.station.toLowerCase().replace(/[^a-z0-9]+/g, '-')}` : ''}`, items as unknown as Record<string, unknown>[], COLUMNS)
})
