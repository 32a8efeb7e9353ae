/**
 * Every page with no signal, for every role, at phone size: each says plainly where it stands — the
 * device's copy with its time, or what needs the connection — and none shows a browser's fetch text.
 * The device is taken out only once it says it is ready (its own signal, not a time).
 */
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { NAVIGATION, canSee } from '../../shared/navigation'
import type { Role } from '../../shared/types/user'
import { api, DEMO, signIn } from '../support/api'
import { launchBrowser, PHONE, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const RAW_FETCH_TEXT = /Failed to fetch|\[GET\]|\[POST\]|\[PATCH\]|<no response>|NetworkError|TypeError/

/** The browser's flag says "online" whatever happens (Chromium behind a service worker, Wi-Fi with no internet). */
function lyingConnectionFlag() {
  Object.defineProperty(Navigator.prototype, 'onLine', { configurable: true, get: () => true })
  for (const type of ['online', 'offline'])
    window.addEventListener(type, event => event.stopImmediatePropagation(), true)
}

/** The pages a role opens: its navigation, the start page, the device, the account, a record of each kind it reads. */
async function pagesFor(email: string): Promise<string[]> {
  const cookie = await signIn(email)
  const roles = (await api('/api/me', { cookie })).body.roles as Role[]
  const paths = ['/', ...NAVIGATION.filter(item => canSee(item, roles)).map(item => item.to), '/device', '/account']
  const worksheets = await api('/api/worksheets?pageSize=1', { cookie })
  if (worksheets.status === 200 && worksheets.body.items[0]) paths.push(`/worksheets/${worksheets.body.items[0].id}`)
  const units = await api('/api/accumulators?installed=true&pageSize=1', { cookie })
  if (units.status === 200 && units.body.items[0]) paths.push(`/fleet/units/${units.body.items[0].id}`)
  for (const [list, page] of [['/api/tools', '/tools'], ['/api/specifications', '/specifications']]) {
    const first = await api(`${list}?pageSize=1`, { cookie })
    if (first.status === 200 && first.body.items[0]) paths.push(`${page}/${first.body.items[0].id}`)
  }
  if (roles.includes('technician')) paths.push('/worksheets/new')
  return paths
}

async function readyThenOffline(email: string): Promise<Page> {
  const page = await signedInPage(browser, email, undefined, { viewport: PHONE })
  await page.context().addInitScript(lyingConnectionFlag)
  await page.reload()
  // The device's own signal: the app kept, and the station's data for whoever services units.
  // The service worker precaches the app first: with both cores busy (CI) that took over 30 s once.
  await expect.poll(() => page.getByTestId('connection').getAttribute('data-ready'), { timeout: 120_000 }).toBe('true')
  await page.context().setOffline(true)
  return page
}

describe('every page with no signal, at phone size', () => {
  for (const [role, email] of Object.entries(DEMO)) {
    it(`as the ${role}: each page says where it stands, and no fetch text`, { timeout: 240_000 }, async () => {
      const paths = await pagesFor(email)
      const page = await readyThenOffline(email)
      for (const path of paths) {
        await page.goto(path)
        await expect.poll(() => page.getByTestId('offline-banner').isVisible(), { message: `${path}: the offline banner` }).toBe(true)
        await expect.poll(() => page.locator('main h1').first().isVisible(), { message: `${path}: a heading` }).toBe(true)
        // Settled: nothing is still loading (a page that waits forever fails here).
        await expect.poll(async () => /Loading|Checking|Making the code/.test(await page.locator('main').innerText()), { message: `${path}: still loading` }).toBe(false)
        const text = await page.locator('body').innerText()
        expect(text.match(RAW_FETCH_TEXT) && text, `${path} shows fetch text`).toBeNull()
        expect(text, `${path}: the banner says what the device holds`).toMatch(/No connection to Chargewell\.[\s\S]*(Ready offline|Not ready offline)/)
        // The lists a technician walks out with come from the device's copy, with its time.
        if (path === '/fleet') expect(text).toMatch(/installed units as this device holds them, as of|holds no copy of the fleet/)
        if (path === '/worksheets') expect(text).toMatch(/Worksheets on this device/)
      }
      await page.context().close()
    })
  }
})
