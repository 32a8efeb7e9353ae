import type { DueBucket } from '../types/due'
import { stationDate } from './station-time'

/**
 * When an installed unit's next check falls: its specification's interval after its last released check,
 * counted in calendar days at the station (so month ends, leap days and daylight-saving changes move
 * nothing), brought forward to the day its pre-charge trend is forecast to leave the band when that
 * comes first. Pure: the server lists, the tests check.
 */

/** A calendar date plus whole days (YYYY-MM-DD in, out): no clock time, so no time-zone shift. */
export function addDays(day: string, days: number): string {
  const [year, month, date] = day.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(year, month - 1, date + days)).toISOString().slice(0, 10)
}

export function bucketOf(dueOn: string, today: string): DueBucket {
  if (dueOn < today) return 'overdue'
  if (dueOn <= addDays(today, 6)) return 'this-week'
  if (dueOn <= addDays(today, 29)) return 'this-month'
  return 'later'
}

export interface DueInput {
  /** The last released check (an instant), or null when the unit has none. */
  lastServiceAt: string | Date | null
  /** The specification's check interval, days. */
  intervalDays: number | null
  /** When its pre-charge trend is forecast to leave the band (an instant), if it is. */
  predictedOutOfLimitsAt: string | null
  timeZone: string
  /** Today at the station (YYYY-MM-DD). */
  today: string
}

export interface DueAnswer {
  dueOn: string
  scheduledOn: string | null
  lastCheckOn: string | null
  bucket: DueBucket
  reason: string
  broughtForward: boolean
}

export function dueOf(input: DueInput): DueAnswer {
  const lastCheckOn = input.lastServiceAt ? stationDate(input.timeZone, input.lastServiceAt) : null
  if (!lastCheckOn || !input.intervalDays) {
    const reason = !lastCheckOn
      ? 'No released check on record: check it now.'
      : 'Its specification sets no check interval: check it now, and have engineering set one.'
    const bucket = bucketOf(input.today, input.today)
    return { dueOn: input.today, scheduledOn: null, lastCheckOn, bucket, reason, broughtForward: false }
  }
  const scheduledOn = addDays(lastCheckOn, input.intervalDays)
  const forecastOn = input.predictedOutOfLimitsAt ? stationDate(input.timeZone, input.predictedOutOfLimitsAt) : null
  if (forecastOn && forecastOn < scheduledOn) {
    return {
      dueOn: forecastOn,
      scheduledOn,
      lastCheckOn,
      bucket: bucketOf(forecastOn, input.today),
      reason: `Brought forward from ${scheduledOn}: its pre-charge trend is forecast to leave the band on ${forecastOn}.`,
      broughtForward: true,
    }
  }
  return {
    dueOn: scheduledOn,
    scheduledOn,
    lastCheckOn,
    bucket: bucketOf(scheduledOn, input.today),
    reason: `Every ${input.intervalDays} days; last released check ${lastCheckOn}.`,
    broughtForward: false,
  }
}
