import { dueQuerySchema } from '#shared/schemas/due'
import { calendarKey, dueList } from '../../services/due'

/** What falls due: every installed unit's next check, by station and by how soon, each with its reason. */
export default defineEventHandler(async (event) => {
  const { user, scope } = await requireScope(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(dueQuerySchema))
  const list = await dueList(query, scope)
  const calendarAddress = query.station
    ? `${publicAddress(event)}/api/due/calendar?${new URLSearchParams({ station: query.station, user: String(user.id), key: calendarKey(user.id, query.station) })}`
    : null
  return { ...list, calendarAddress }
})
