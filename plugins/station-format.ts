import { setStationLocale } from '#shared/gas/format'

/** Figures in the station's locale on the server's render and in the browser alike (shared/gas/format.ts). */
export default defineNuxtPlugin(() => {
  setStationLocale(String(useRuntimeConfig().public.locale))
})
