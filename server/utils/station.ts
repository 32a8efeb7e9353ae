import { displayFormat, stationDate } from '#shared/utils/station-time'

/** Today's date at the station (YYYY-MM-DD): a calibration due today is still good until the station's midnight. */
export function stationToday(): string {
  return stationDate(String(useRuntimeConfig().public.stationTimeZone))
}

/**
 * Dates and figures written as the pages write them (station time zone, the configured locale), for PDFs and
 * e-mail.
 */
export function displayFormatOfStation() {
  const { stationTimeZone, locale } = useRuntimeConfig().public
  return displayFormat({ locale: String(locale), timeZone: String(stationTimeZone) })
}
