import { dueCalendarQuerySchema } from '#shared/schemas/due'
import { User } from '../../models'
import { calendarKeyMatches, dueCalendar } from '../../services/due'
import { scopeOf } from '../../services/scope'

/**
 * A station's due work as an iCalendar feed. A calendar program cannot sign in: the address carries the
 * user's key for the station (shown on the Due page), and the feed holds what that user may see now;
 * without a key, a session is needed. A disabled user's address no longer answers.
 */
export default defineEventHandler(async (event) => {
  const raw = getQuery(event)
  const keyed = typeof raw.key === 'string' && typeof raw.station === 'string' && typeof raw.user === 'string'
    && /^\d{1,10}$/.test(raw.user) && calendarKeyMatches(Number(raw.user), raw.station, raw.key)
  const holder = keyed ? await User.findByPk(Number(raw.user)) : null
  const user = holder && !holder.disabled ? holder : await requireAbility(event, 'register.read')
  const { station } = await getValidatedQuery(event, validateWith(dueCalendarQuerySchema))
  setResponseHeader(event, 'content-type', 'text/calendar; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `inline; filename="chargewell-due-${station.toLowerCase().replace(/[^a-z0-9]+/g, '-')}.ics"`)
  return dueCalendar(station, await scopeOf(user))
})
