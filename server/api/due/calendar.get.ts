import { dueCalendarQuerySchema } from '#shared/schemas/due'
import { calendarKeyMatches, dueCalendar } from '../../services/due'

/**
 * A station's due work as an iCalendar feed. A calendar program cannot sign in: the address carries
 * the station's key (shown on the Due page to signed-in users); without it, a session is needed.
 */
export default defineEventHandler(async (event) => {
  const raw = getQuery(event)
  const keyed = typeof raw.key === 'string' && typeof raw.station === 'string' && calendarKeyMatches(raw.station, raw.key)
  if (!keyed) await requireAbility(event, 'register.read')
  const { station } = await getValidatedQuery(event, validateWith(dueCalendarQuerySchema))
  setResponseHeader(event, 'content-type', 'text/calendar; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `inline; filename="chargewell-due-${station.toLowerCase().replace(/[^a-z0-9]+/g, '-')}.ics"`)
  return dueCalendar(station)
})
