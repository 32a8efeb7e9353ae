/**
 * The station's calendar: "today", and dates written the way people at the station read them.
 * A gauge's calibration runs out at the end of its due day *at the station*, not at UTC midnight.
 * Pure (Intl only), so the server, the pages and the PDF all read the same date.
 */

const cache = new Map<string, Intl.DateTimeFormat>()

function formatter(locale: string, timeZone: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = JSON.stringify([locale, timeZone, options])
  let found = cache.get(key)
  if (!found) {
    found = new Intl.DateTimeFormat(locale, { ...options, timeZone })
    cache.set(key, found)
  }
  return found
}

/** The calendar date (YYYY-MM-DD) at the station for an instant (default: now). */
export function stationDate(timeZone: string, instant: Date | string | number = new Date()): string {
  // en-CA writes dates as YYYY-MM-DD.
  return formatter('en-CA', timeZone, { year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(instant))
}

const numbers = new Map<string, Intl.NumberFormat>()
function numberFormat(locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = JSON.stringify([locale, options])
  let found = numbers.get(key)
  if (!found) {
    found = new Intl.NumberFormat(locale, options)
    numbers.set(key, found)
  }
  return found
}

export interface DisplaySettings {
  locale: string
  timeZone: string
  /** Times carry their zone ("14:05 UTC"): a filed record is read far from its station. */
  showZone?: boolean
}

const DATE: Intl.DateTimeFormatOptions = { day: 'numeric', month: 'short', year: 'numeric' }
const TIME_OF_DAY: Intl.DateTimeFormatOptions = { hour: '2-digit', minute: '2-digit' }

/** One way of writing dates and times for every page, the PDF and e-mail. */
export function displayFormat(settings: DisplaySettings) {
  const { locale, timeZone } = settings
  const TIME: Intl.DateTimeFormatOptions = settings.showZone ? { ...TIME_OF_DAY, timeZoneName: 'short' } : TIME_OF_DAY
  const valid = (value: string | Date | null | undefined): value is string | Date =>
    !!value && !Number.isNaN(new Date(value).getTime())
  return {
    /** An instant as a date at the station: "2 Dec 2026". */
    date: (value: string | Date | null | undefined) =>
      valid(value) ? formatter(locale, timeZone, DATE).format(new Date(value)) : '—',
    /** An instant as date and time at the station: "2 Dec 2026, 14:05". */
    dateTime: (value: string | Date | null | undefined) =>
      valid(value) ? formatter(locale, timeZone, { ...DATE, ...TIME }).format(new Date(value)) : '—',
    /** An instant as a time of day at the station: "14:05". */
    time: (value: string | Date | null | undefined) =>
      valid(value) ? formatter(locale, timeZone, TIME).format(new Date(value)) : '—',
    /**
     * A calendar date that is already the station's (YYYY-MM-DD, e.g. a calibration due date), written the same
     * way, never shifted.
     */
    day: (value: string | null | undefined) =>
      value && /^\d{4}-\d{2}-\d{2}/.test(value)
        ? formatter(locale, 'UTC', DATE).format(new Date(`${value.slice(0, 10)}T12:00:00Z`))
        : '—',
    /** A plain figure with a fixed number of decimals, in the station's locale, never grouped (as the engine's). */
    decimal: (value: number | null | undefined, decimals = 1) =>
      typeof value === 'number' && Number.isFinite(value)
        ? numberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals, useGrouping: false })
            .format(value)
        : '—',
    /** A count: "100,000". */
    count: (value: number) => numberFormat(locale, { maximumFractionDigits: 0 }).format(value),
  }
}

let station: DisplaySettings = { locale: 'en-GB', timeZone: 'UTC' }

/** The station's display settings, set once at start on the server and in the browser (the app's config). */
export function setStationDisplay(settings: DisplaySettings): void {
  station = settings
}

/** Dates and times in messages of shared code (a refusal, an audit line), written as the pages write them. */
export function stationDisplay() {
  return displayFormat(station)
}
