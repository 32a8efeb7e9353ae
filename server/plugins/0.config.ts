/**
 * Sets the station's figure locale; refuses to start a production server without a session password: without one every
 * sign-in would fail. Development (`nuxi dev`) writes one into .env by itself.
 */
import { setStationLocale } from '#shared/gas/format'
import { setStationDisplay } from '#shared/utils/station-time'

export default defineNitroPlugin(() => {
  // Figures in messages, records and PDFs in the station's locale (shared/gas/format.ts).
  const { locale, stationTimeZone } = useRuntimeConfig().public
  setStationLocale(String(locale))
  setStationDisplay({ locale: String(locale), timeZone: String(stationTimeZone) })
  if (import.meta.dev) return
  const password = useRuntimeConfig().session?.password ?? ''
  if (password.length < 32) {
    console.error([
      'Chargewell will not start: NUXT_SESSION_PASSWORD is not set (or is shorter than 32 characters).',
      'Set it to a long random secret before starting the server, for example:',
      '  export NUXT_SESSION_PASSWORD="$(openssl rand -hex 32)"',
      'Keep it secret and keep it the same across restarts, or everyone is signed out.',
    ].join('\n'))
    process.exit(1)
  }
  if (!useRuntimeConfig().publicUrl) {
    console.warn('NUXT_PUBLIC_URL is not set: labels open the address they were printed from, and links in e-mails '
      + 'point at http://localhost:3000. Set it to the address users open Chargewell at.')
  }
})
