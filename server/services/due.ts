import { createHmac, timingSafeEqual } from 'node:crypto'
import { Op } from 'sequelize'
import { DUE_BUCKET_LABELS, type DueBucket, type DueItem, type DueListDto } from '#shared/types/due'
import { dueOf } from '#shared/utils/due'
import { stationDate } from '#shared/utils/station-time'
import { Accumulator, Aircraft, Specification, Station, UnitTrend } from '../models'
import { withinScope, type Scope } from './scope'

/**
 * The due list: every installed unit's next check (see shared/utils/due.ts), by station (the
 * aircraft's base) and by how soon. One read of the installed units with their stored trends and
 * the current specifications' intervals: bounded by the fleet, never by the history.
 */
export async function dueList(
  filter: { station?: string, bucket?: DueBucket },
  scope: Scope,
): Promise<Omit<DueListDto, 'calendarAddress'>> {
  const organisationZone = String(useRuntimeConfig().public.stationTimeZone)
  const [units, stations, zones] = await Promise.all([
    Accumulator.findAll({
      where: withinScope(scope, { aircraftId: { [Op.ne]: null } }),
      include: [
        { model: Aircraft, as: 'aircraft', required: true, where: { active: true, ...(filter.station ? { base: filter.station } : {}) } },
        { model: UnitTrend, as: 'trend', required: false, attributes: ['lastServiceAt', 'fit'] },
      ],
    }),
    Aircraft.findAll({ where: withinScope(scope, {}, 'id'), attributes: ['base'], group: ['base'], order: [['base', 'ASC']] }),
    Station.findAll({ attributes: ['name', 'timeZone'] }),
  ])
  // Each unit falls due by the calendar of its aircraft's station.
  const zoneOf = new Map(zones.map(station => [station.name, station.timeZone]))
  const timeZoneOf = (base: string) => zoneOf.get(base) ?? organisationZone
  const filterZone = filter.station ? timeZoneOf(filter.station) : organisationZone
  const today = stationDate(filterZone)
  const intervals = new Map((await Specification.findAll({
    where: { status: 'current', partNumber: [...new Set(units.map(unit => unit.partNumber))] },
    attributes: ['partNumber', 'checkIntervalDays'],
  })).map(row => [row.partNumber, row.checkIntervalDays]))
  const all: DueItem[] = units.map((unit) => {
    const joined = unit as Accumulator & { aircraft: Aircraft, trend?: UnitTrend | null }
    const timeZone = timeZoneOf(joined.aircraft.base)
    const due = dueOf({
      lastServiceAt: joined.trend?.lastServiceAt ?? null,
      intervalDays: intervals.get(unit.partNumber) ?? null,
      predictedOutOfLimitsAt: joined.trend?.fit?.predictedOutOfLimitsAt ?? null,
      timeZone,
      today: stationDate(timeZone),
    })
    return {
      accumulatorId: unit.id,
      registration: joined.aircraft.registration,
      aircraftType: joined.aircraft.type,
      station: joined.aircraft.base,
      position: unit.position,
      partNumber: unit.partNumber,
      serialNumber: unit.serialNumber,
      ...due,
    }
  })
  all.sort((a, b) =>
    a.dueOn.localeCompare(b.dueOn) || a.registration.localeCompare(b.registration) || a.accumulatorId - b.accumulatorId)
  const buckets = Object.keys(DUE_BUCKET_LABELS) as DueBucket[]
  const counts = Object.fromEntries(buckets.map(bucket => [bucket, 0])) as Record<DueBucket, number>
  for (const item of all) counts[item.bucket]++
  return {
    today,
    stations: stations.map(row => row.base),
    station: filter.station ?? null,
    counts,
    items: filter.bucket ? all.filter(item => item.bucket === filter.bucket) : all,
  }
}

/**
 * The key in a user's calendar address for a station: calendar programs cannot sign in, so the address is the
 * credential. It is the user's: the feed holds what that user may see now (a disabled user's feed is refused).
 */
export function calendarKey(userId: number, station: string): string {
  return createHmac('sha256', String(useRuntimeConfig().session.password)).update(`due-calendar:${userId}:${station}`).digest('base64url').slice(0, 32)
}

export function calendarKeyMatches(userId: number, station: string, key: string): boolean {
  const [expected, given] = [Buffer.from(calendarKey(userId, station)), Buffer.from(key)]
  return expected.length === given.length && timingSafeEqual(expected, given)
}

/** A station's due work as an iCalendar feed: one all-day event per unit due within 30 days or overdue. */
export async function dueCalendar(station: string, scope: Scope): Promise<string> {
  const { default: ical } = await import('ical-generator')
  const list = await dueList({ station }, scope)
  const timeZone = (await Station.findOne({ where: { name: station }, attributes: ['timeZone'] }))?.timeZone
  const calendar = ical({ name: `Chargewell — accumulator checks due at ${station}`, timezone: timeZone ?? String(useRuntimeConfig().public.stationTimeZone) })
  for (const item of list.items.filter(candidate => candidate.bucket !== 'later')) {
    const [year, month, day] = item.dueOn.split('-').map(Number) as [number, number, number]
    calendar.createEvent({
      id: `chargewell-due-${item.accumulatorId}-${item.dueOn}`,
      start: new Date(Date.UTC(year, month - 1, day)),
      allDay: true,
      summary: `${item.bucket === 'overdue' ? 'OVERDUE: ' : ''}${item.registration} ${item.position ?? ''} — pre-charge check`,
      description: `P/N ${item.partNumber} S/N ${item.serialNumber}. ${item.reason}\nStart the worksheet: ${publicAddress()}/worksheets/new?unit=${item.accumulatorId}`,
      url: `${publicAddress()}/worksheets/new?unit=${item.accumulatorId}`,
    })
  }
  return calendar.toString()
}
