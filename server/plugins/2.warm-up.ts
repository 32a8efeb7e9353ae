/**
 * Loads at start what the first page and the first figures would otherwise load while a user waits,
 * holding up everyone's requests: Vue's server renderer and the app's server bundle (about 80 ms of
 * module loading on this machine, during the first page a user opened) and the station locale's number
 * and date formats (ICU data: about 14 ms, while the first Trends page wrote its figures). The sign-in
 * page is rendered once, inside the server; /api/health says "starting" until that is done.
 * Measured by `npm run bench:scale` ("first requests after start").
 */
import { formatDecimalValue } from '#shared/gas/format'
import { stationDisplay } from '#shared/utils/station-time'

export default defineNitroPlugin((nitroApp) => {
  // A one-off task (scripts/task.mjs) serves no one; a restore must not open its database before the copy is in.
  if (process.env.CHARGEWELL_TASK) return
  const display = stationDisplay()
  const now = new Date()
  for (const decimals of [0, 1, 2, 3]) {
    formatDecimalValue(1.5, decimals)
    display.decimal(1.5, decimals)
  }
  display.count(100_000)
  display.date(now)
  display.dateTime(now)
  display.time(now)
  display.day('2026-01-01')
  startUp(async () => {
    await useDB()
    if (import.meta.dev) return
    const page = await nitroApp.localFetch('/login', { headers: { accept: 'text/html' } })
    await page.text()
  })
})
