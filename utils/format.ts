import { displayFormat, stationDate } from '#shared/utils/station-time'

/**
 * Dates, times and figures as people at the station read them — the one place the app decides
 * how they are written: the user's locale (NUXT_PUBLIC_LOCALE) and the station's time zone
 * (NUXT_PUBLIC_STATION_TIME_ZONE), the same on the server and in the browser, so a page renders
 * once and hydrates without a change. Exports and the API keep ISO 8601 in UTC.
 */
function display() {
  const { stationTimeZone, locale } = useRuntimeConfig().public
  return displayFormat({ locale: String(locale), timeZone: useRecordTimeZone().value ?? String(stationTimeZone) })
}

/**
 * The time zone of the record on screen: its aircraft's station's, set by a record's page while it is open
 * (`showRecordTimesIn`), so its dates read as they did at the station.
 */
export function useRecordTimeZone() {
  return useState<string | null>('record-time-zone', () => null)
}

/** While this page is open, dates and times are written in the zone `zone` gives (the record's station's). */
export function showRecordTimesIn(zone: () => string | null | undefined) {
  const state = useRecordTimeZone()
  state.value = zone() ?? null
  watch(zone, (value) => {
    state.value = value ?? null
  })
  onBeforeUnmount(() => {
    state.value = null
  })
}

export const formatDate = (value: string | Date | null | undefined) => display().date(value)
export const formatDateTime = (value: string | Date | null | undefined) => display().dateTime(value)
export const formatTime = (value: string | Date | null | undefined) => display().time(value)
/** A station calendar date kept as YYYY-MM-DD (calibration due, check date). */
export const formatDay = (value: string | null | undefined) => display().day(value)
export const formatDecimal = (value: number | null | undefined, decimals = 1) => display().decimal(value, decimals)
export const formatCount = (value: number) => display().count(value)

/** Today's date at the station (YYYY-MM-DD), e.g. the default of a date field. */
export function stationToday(): string {
  return stationDate(String(useRuntimeConfig().public.stationTimeZone))
}

/** The whole display format (dates, times, figures) for code that lays out a record. */
export function useDisplayFormat() {
  return display()
}
