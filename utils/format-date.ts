/**
 * Dates and times as people at the station read them: in the station's time zone
 * (NUXT_PUBLIC_STATION_TIME_ZONE), the same on the server and in the browser, so a page
 * renders once and hydrates without a change. Exports and the API keep ISO 8601 in UTC.
 */
const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const { stationTimeZone, locale } = useRuntimeConfig().public
  const key = JSON.stringify([stationTimeZone, locale, options])
  let found = formatters.get(key)
  if (!found) {
    found = new Intl.DateTimeFormat(String(locale), { ...options, timeZone: String(stationTimeZone) })
    formatters.set(key, found)
  }
  return found
}

export function formatDateTime(value: string | Date | null | undefined): string {
  if (!value) return '—'
  return formatter({ day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' }).format(new Date(value))
}

export function formatDate(value: string | Date | null | undefined): string {
  if (!value) return '—'
  return formatter({ day: 'numeric', month: 'short', year: 'numeric' }).format(new Date(value))
}
