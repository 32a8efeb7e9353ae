import { describe, expect, it } from 'vitest'
import { addDays, bucketOf, dueOf } from '../../shared/utils/due'

// Calendar facts (Gregorian calendar; IANA time zone rules for Europe/Oslo and Pacific/Auckland): common
// practice (no source).
describe('the due date of a unit', () => {
  it('counts calendar days across month ends and leap days', () => {
    expect(addDays('2026-01-31', 30)).toBe('2026-03-02')
    expect(addDays('2026-01-31', 28)).toBe('2026-02-28')
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29')
    expect(addDays('2028-02-29', 365)).toBe('2029-02-28')
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01')
  })

  it('counts from the station date of the last check, whatever daylight saving does', () => {
    const base = { intervalDays: 90, predictedOutOfLimitsAt: null, today: '2026-12-04' }
    // 00:30 UTC on the night clocks go forward in Oslo is already 29 March there.
    expect(dueOf({ ...base, timeZone: 'Europe/Oslo', lastServiceAt: '2026-03-29T00:30:00Z' }).lastCheckOn).toBe('2026-03-29')
    expect(dueOf({ ...base, timeZone: 'Europe/Oslo', lastServiceAt: '2026-03-29T00:30:00Z' }).dueOn).toBe('2026-06-27')
    // 22:30 UTC on 24 October is 00:30 on the 25th in Oslo (summer time), the night clocks go back.
    expect(dueOf({ ...base, timeZone: 'Europe/Oslo', lastServiceAt: '2026-10-24T22:30:00Z', intervalDays: 1 }).dueOn).toBe('2026-10-26')
    // A check late in the UTC day is the next day in Auckland.
    expect(dueOf({ ...base, timeZone: 'Pacific/Auckland', lastServiceAt: '2026-06-30T13:00:00Z', intervalDays: 30 }).dueOn).toBe('2026-07-31')
    expect(dueOf({ ...base, timeZone: 'UTC', lastServiceAt: '2026-06-30T13:00:00Z', intervalDays: 30 }).dueOn).toBe('2026-07-30')
  })

  it('is brought forward when the trend leaves the band first, and says so', () => {
    const due = dueOf({
      lastServiceAt: '2026-11-01T10:00:00Z', intervalDays: 90, predictedOutOfLimitsAt: '2026-12-08T06:00:00Z', timeZone: 'UTC', today: '2026-12-04',
    })
    expect(due).toMatchObject({ dueOn: '2026-12-08', scheduledOn: '2027-01-30', broughtForward: true, bucket: 'this-week' })
    expect(due.reason).toBe('Brought forward from 2027-01-30: its pre-charge trend is forecast to leave the band on 2026-12-08.')
    const later = dueOf({
      lastServiceAt: '2026-11-01T10:00:00Z', intervalDays: 90, predictedOutOfLimitsAt: '2027-06-01T00:00:00Z', timeZone: 'UTC', today: '2026-12-04',
    })
    expect(later).toMatchObject({ dueOn: '2027-01-30', broughtForward: false, reason: 'Every 90 days; last released check 2026-11-01.' })
  })

  it('a unit never checked is due now; buckets by days from today', () => {
    expect(dueOf({ lastServiceAt: null, intervalDays: 90, predictedOutOfLimitsAt: null, timeZone: 'UTC', today: '2026-12-04' }))
      .toMatchObject({ dueOn: '2026-12-04', bucket: 'this-week', reason: 'No released check on record: check it now.' })
    expect(bucketOf('2026-12-03', '2026-12-04')).toBe('overdue')
    expect(bucketOf('2026-12-10', '2026-12-04')).toBe('this-week')
    expect(bucketOf('2026-12-11', '2026-12-04')).toBe('this-month')
    expect(bucketOf('2027-01-02', '2026-12-04')).toBe('this-month')
    expect(bucketOf('2027-01-03', '2026-12-04')).toBe('later')
  })
})
