import { setStationLocale } from '#shared/gas/format'
import { setStationDisplay } from '#shared/utils/station-time'

/**
 * Figures, dates and times in the station's format on the server's render and in the browser alike
 * (shared/gas/format.ts, shared/utils/station-time.ts), also in messages written by shared code.
 */
export default defineNuxtPlugin(() => {
  const { locale, stationTimeZone } = useRuntimeConfig().public
  setStationLocale(String(locale))
  setStationDisplay({ locale: String(locale), timeZone: String(stationTimeZone) })
})
