/**
 * One way of writing dates, times and figures (shared/utils/station-time.ts), and "today" at the
 * station rather than at UTC midnight.
 */
import { describe, expect, it } from 'vitest'
import { formatTemperature } from '../../shared/gas/format'
import { displayFormat, stationDate } from '../../shared/utils/station-time'

describe('dates at the station', () => {
  it('is still yesterday in Anchorage when UTC has passed midnight, and already tomorrow in Auckland', () => {
    // 2026-12-02 05:00 UTC. Offsets from the IANA time zone database (tzdata, as bundled in Node's ICU):
    // Anchorage is UTC−9 in December, Auckland UTC+13 (daylight time).
    const instant = new Date('2026-12-02T05:00:00Z')
    expect(stationDate('UTC', instant)).toBe('2026-12-02')
    expect(stationDate('America/Anchorage', instant)).toBe('2026-12-01')
    expect(stationDate('Pacific/Auckland', instant)).toBe('2026-12-02')
    expect(stationDate('Pacific/Auckland', new Date('2026-12-02T11:30:00Z'))).toBe('2026-12-03')
  })

  it('writes every date the same way, in the station\'s zone; a calendar date is never shifted', () => {
    const oslo = displayFormat({ locale: 'en-GB', timeZone: 'Europe/Oslo' })
    // Europe/Oslo is UTC+1 in winter (tzdata): 23:30 UTC on 1 Dec is 00:30 on 2 Dec there.
    expect(oslo.date('2026-12-01T23:30:00Z')).toBe('2 Dec 2026')
    expect(oslo.dateTime('2026-12-01T23:30:00Z')).toBe('2 Dec 2026, 00:30')
    expect(oslo.time('2026-12-01T23:30:00Z')).toBe('00:30')
    const anchorage = displayFormat({ locale: 'en-GB', timeZone: 'America/Anchorage' })
    expect(anchorage.day('2027-04-21')).toBe('21 Apr 2027')
    expect(anchorage.date(null)).toBe('—')
    expect(anchorage.date('not a date')).toBe('—')
  })

  it('writes figures in the user\'s locale: a decimal comma in German, a point in British English', () => {
    expect(displayFormat({ locale: 'en-GB', timeZone: 'UTC' }).decimal(0.7361, 2)).toBe('0.74')
    expect(displayFormat({ locale: 'de-DE', timeZone: 'UTC' }).decimal(0.7361, 2)).toBe('0,74')
    expect(displayFormat({ locale: 'en-GB', timeZone: 'UTC' }).count(100000)).toBe('100,000')
  })
})

describe('temperatures', () => {
  it('keep their tenth of a degree whatever their size: 100.4 °F is not "100 °F"', () => {
    expect(formatTemperature({ value: 100.4, unit: 'F' })).toBe('100.4 °F')
    expect(formatTemperature({ value: 15, unit: 'C' })).toBe('15.0 °C')
    expect(formatTemperature({ value: -40, unit: 'C' })).toBe('-40.0 °C')
  })
})
