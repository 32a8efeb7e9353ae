/**
 * On the ramp with no signal, in real Chromium: the app opens from its service worker, a worksheet
 * is started and completed on the device, waits "ready to sign", and syncs when the connection
 * returns — recomputed by the server. A conflict (a gauge whose calibration lapsed before it was
 * used) is shown to the technician, never resolved silently. Labels and the settle forecast too.
 */
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { baseURL } from '../support/file-server'

const PNG = Buffer.from([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13])

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

/**
 * The browser's own flag is not to be trusted: Chromium 150 keeps `navigator.onLine` true after the
 * network is cut and a page comes from the service worker, and Wi-Fi with no internet says the same.
 * Every offline test runs with a flag that always says "online" and never fires online/offline, so
 * the app must find out by reaching the server.
 */
function lyingConnectionFlag() {
  Object.defineProperty(Navigator.prototype, 'onLine', { configurable: true, get: () => true })
  for (const type of ['online', 'offline'])
    window.addEventListener(type, event => event.stopImmediatePropagation(), true)
}

/** Signed in, the service worker in control and the device's reference data kept: ready to go offline. */
async function readyForTheRamp(email = 'technician@chargewell.test'): Promise<Page> {
  const page = await signedInPage(browser, email)
  await page.context().addInitScript(lyingConnectionFlag)
  // The device's own signal that it holds what offline work needs (the app and the station's data), in the header.
  await page.reload()
  // The service worker precaches the app first: with both cores busy (CI) that can take over 30 s.
  await expect.poll(() => page.getByTestId('connection').getAttribute('data-ready'), { timeout: 120_000 }).toBe('true')
  return page
}

async function fillOffline(page: Page, registration: RegExp, position: RegExp, workOrder: string, gauge = /GA-0141(?!B)/) {
  const context: BrowserContext = page.context()
  await context.setOffline(true)
  await page.goto('/worksheets/new')
  await expect.poll(() => page.getByTestId('offline-start').innerText()).toMatch(/No connection/)
  await expect.poll(() => page.getByTestId('connection').innerText()).toMatch(/Offline/)
  await page.getByRole('button', { name: registration }).click()
  await page.getByRole('button', { name: position }).click()
  await page.getByLabel('Work order').fill(workOrder)
  await page.getByRole('button', { name: 'Start worksheet' }).click()
  await page.waitForURL(url => url.pathname.startsWith('/worksheets/local/'))
  for (const check of ['systemDepressurised', 'aircraftSafe', 'eyeProtection']) {
    await page.getByTestId(`confirm-${check}`).click()
    await expect.poll(() => page.getByTestId(`confirm-${check}`).getAttribute('aria-pressed')).toBe('true')
  }
  // The last confirmation completes the step and moves on to the tools.
  await page.getByTestId('confirm-nitrogenOnly').click()
  await expect.poll(() => page.getByRole('heading', { name: '2 · Tools' }).isVisible()).toBe(true)
  await page.getByRole('button', { name: gauge }).click()
  await page.getByRole('button', { name: /NC-07/ }).click()
  await page.getByRole('button', { name: 'Save and continue' }).click()
}

/**
 * From the as-found to the last step before signing, on the device: the reading, its verdict worked out there,
 * "No action", the as-left, the finishing checks (and a photo, taken with no signal, when given); ready to sign.
 */
type Photo = { name: string, mimeType: string, buffer: Buffer }
async function completeOnDevice(page: Page, asFound: string, photo?: Photo) {
  await page.getByLabel(/As-found reading/).fill(asFound)
  await page.getByRole('button', { name: 'Record as-found' }).click()
  // The verdict is worked out on the device by the shared engine.
  await expect.poll(() => page.getByTestId('result-as-found').innerText()).toMatch(/Target/)
  await page.getByRole('button', { name: 'Next: Action' }).click()
  await page.getByRole('button', { name: /No action/ }).click()
  await page.getByRole('dialog').getByTestId('confirm-yes').click()
  await page.getByRole('button', { name: 'Record as-left' }).click()
  await expect.poll(() => page.getByTestId('result-as-left').isVisible()).toBe(true)
  await page.getByRole('button', { name: 'Next: Finish' }).click()
  await page.getByRole('button', { name: /Charging valve leak-checked/ }).click()
  await page.getByRole('button', { name: /Valve cap refitted/ }).click()
  if (photo) {
    // The gauge photo is taken with no signal: kept on the device, sent with the worksheet.
    await page.getByLabel(/Gauge photo/).setInputFiles(photo)
    await expect.poll(() => page.getByTestId('kept-photos').innerText()).toContain(photo.name)
  }
  await page.getByRole('button', { name: 'Save and continue' }).click()
  await expect.poll(() => page.getByTestId('local-banner').innerText()).toMatch(/Ready to sign[\s\S]*needs the connection/)
}

describe('a worksheet with no signal', () => {
  it('starts, fills and completes on the device, waits to be signed, then syncs and is recomputed by the server', { timeout: 180_000 }, async () => {
    const page = await readyForTheRamp()
    await fillOffline(page, /QX-FMJ/, /System 1/, 'WO-RAMP-0001')
    await page.getByLabel(/Gas temperature/).fill('12')
    await page.getByLabel(/Minutes since/).fill('60')
    await page.getByRole('button', { name: 'Save and continue' }).click()
    await completeOnDevice(page, '1420', { name: 'gauge-ramp.png', mimeType: 'image/png', buffer: PNG })
    await expect.poll(() => page.getByTestId('connection').innerText()).toMatch(/Offline[\s·]*1 worksheet waiting to send/)
    await page.goto('/device')
    await expect.poll(() => page.getByTestId('queue').innerText()).toMatch(/QX-FMJ · System 1, aft equipment bay · WO-RAMP-0001/)

    // The connection returns: the worksheet is sent, replayed and recomputed; the device opens the server's.
    await page.context().setOffline(false)
    await page.goto('/device')
    await expect.poll(async () => (await page.getByTestId('queue').innerText()), { timeout: 20_000 }).toMatch(/Nothing waits/)
    const list = await api('/api/worksheets?q=WO-RAMP-0001', { cookie: await signIn(DEMO.technician) })
    const id = list.body.items[0].id as number
    const record = (await api(`/api/worksheets/${id}`, { cookie: await signIn(DEMO.technician) })).body
    expect(record.content.offline.conflicts).toEqual([])
    expect(record.attachments.map((attachment: { originalName: string }) => attachment.originalName)).toEqual(['gauge-ramp.png'])
    expect(record.results.asFound.engineVersion).toBeTruthy()
    expect(record.results.asLeft.assessment.verdict).toBeTruthy()
    await page.goto(`/worksheets/${id}`)
    await page.getByRole('navigation', { name: 'Worksheet steps' }).getByRole('button', { name: /Sign/ }).click()
    await page.getByTestId('certify').click()
    await page.getByLabel('Your password, to sign').fill('chargewell-demo')
    await page.getByRole('button', { name: 'Sign worksheet' }).click()
    await expect.poll(() => page.getByTestId('state-badge').first().innerText()).toMatch(/Awaiting countersign/)
    await page.context().close()
  })

  it('a gauge whose calibration lapsed while the device was out: nothing read with it is lost, only what the rules require is redone', { timeout: 180_000 }, async () => {
    const page = await readyForTheRamp()
    // The register changes while the device is out: GA-0152's calibration is now recorded as due last week.
    const admin = await signIn(DEMO.admin)
    const tools = (await api('/api/tools?pageSize=500', { cookie: admin })).body.items as { id: number, assetNumber: string }[]
    const gauge = tools.find(tool => tool.assetNumber === 'GA-0152')!
    const lastWeek = new Date(Date.now() - 7 * 86_400_000).toISOString().slice(0, 10)
    await fillOffline(page, /QX-FMJ/, /System 2/, 'WO-RAMP-0002', /GA-0152/)
    expect((await api(`/api/tools/${gauge.id}`, { method: 'PATCH', cookie: admin, body: { calibrationDue: lastWeek } })).status).toBe(200)
    await page.getByLabel(/Gas temperature/).fill('10')
    await page.getByLabel(/Minutes since/).fill('45')
    await page.getByRole('button', { name: 'Save and continue' }).click()
    await expect.poll(() => page.getByRole('heading', { name: /^4 · As-found/ }).isVisible()).toBe(true)
    // The as-found is read with the gauge the device still believes in: a one-time observation.
    await page.getByLabel(/As-found reading/).fill('1390')
    await page.getByRole('button', { name: 'Record as-found' }).click()
    await expect.poll(() => page.getByTestId('result-as-found').innerText()).toMatch(/Target/)
    await page.context().setOffline(false)
    await page.goto('/device')
    await expect.poll(async () => page.getByText(/change\(s\) to review/).count(), { timeout: 20_000 }).toBeGreaterThan(0)
    await page.getByRole('link', { name: /Worksheet \d+/ }).first().click()
    await page.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))
    await expect.poll(() => page.getByTestId('sync-review').innerText()).toMatch(/Tools was not accepted: Gauge GA-0152: calibration expired[\s\S]*kept on the record as observed[\s\S]*Redo those steps: Tools, As-found\./)
    // The as-found stays on the record, with its time, the gauge and why it does not count; the conditions count.
    await expect.poll(() => page.getByTestId('observations').innerText()).toMatch(/As-found: read 1,?390(\.0)? psig[\s\S]*with gauge GA-0152[\s\S]*Not counted: Taken after the Tools step was refused/)
    const id = Number(new URL(page.url()).pathname.split('/').pop())
    const record = (await api(`/api/worksheets/${id}`, { cookie: await signIn(DEMO.technician) })).body
    expect(record.content.tools).toBeUndefined()
    expect(record.content.conditions.gasTemperature).toMatchObject({ value: 10 })
    expect(record.content.observations.map((observation: { step: string }) => observation.step)).toEqual(['tools', 'asFound'])
    expect(record.content.observations[1].values.reading).toMatchObject({ value: 1390 })
    await page.getByRole('button', { name: /I have read this/ }).click()
    await expect.poll(() => page.getByTestId('sync-review').count()).toBe(0)
    // The tools step is open again, and the lapsed gauge is not shown as chosen.
    await page.getByRole('navigation', { name: 'Worksheet steps' }).getByRole('button', { name: /Tools/ }).click()
    const lapsed = page.getByRole('button', { name: /GA-0152/ })
    await expect.poll(() => lapsed.getAttribute('data-blocked')).toBe('true')
    expect(await lapsed.getAttribute('aria-pressed')).toBe('false')
    await page.context().close()
  })
})

describe('sent in the background', () => {
  it('a worksheet completed with no signal is sent by the service worker after the app is closed and the network returns', { timeout: 180_000 }, async () => {
    const page = await readyForTheRamp()
    const context = page.context()
    await fillOffline(page, /QX-FMA/, /Normal brake/, 'WO-RAMP-0003')
    await page.getByLabel(/Gas temperature/).fill('14')
    await page.getByLabel(/Minutes since/).fill('50')
    await page.getByRole('button', { name: 'Save and continue' }).click()
    await expect.poll(() => page.getByRole('heading', { name: /^4 · As-found/ }).isVisible()).toBe(true)
    // Completed on the device, to the last step before signing.
    await completeOnDevice(page, '1000')
    await expect.poll(() => page.getByTestId('connection').innerText()).toMatch(/1 worksheet waiting to send/)
    // The app is closed while there is no network; then the network returns. No page of the app is open to send
    // the queue: only the service worker can.
    await page.close()
    await context.setOffline(false)
    const cookie = await signIn(DEMO.technician)
    // Chromium fires the background sync the app registered when the connection returns; so that the test does not
    // depend on when, it is fired here too through DevTools (a second firing finds the queue empty), from a blank
    // tab that is not the app.
    const blank = await context.newPage()
    const devtools = await context.newCDPSession(blank)
    const registration = new Promise<string>((resolve) => {
      devtools.on('ServiceWorker.workerRegistrationUpdated', ({ registrations }) => {
        const ours = registrations.find(candidate => candidate.scopeURL.startsWith(baseURL()) && !candidate.isDeleted)
        if (ours) resolve(ours.registrationId)
      })
    })
    await devtools.send('ServiceWorker.enable')
    await devtools.send('ServiceWorker.dispatchSyncEvent', {
      origin: baseURL(), registrationId: await registration, tag: 'chargewell-send-queue', lastChance: false,
    })
    await expect.poll(async () => (await api('/api/worksheets?q=WO-RAMP-0003', { cookie })).body.items.length).toBe(1)
    const id = (await api('/api/worksheets?q=WO-RAMP-0003', { cookie })).body.items[0].id as number
    const record = (await api(`/api/worksheets/${id}`, { cookie })).body
    expect(record.content.conditions.gasTemperature).toMatchObject({ value: 14 })
    expect(record.content.tools.gauge.assetNumber).toBe('GA-0141')
    // Every step replayed and recomputed by the server: ready for the technician to sign.
    expect(record.results.asFound.engineVersion).toBeTruthy()
    expect(record.results.asLeft.assessment.verdict).toBeTruthy()
    expect(record.content.finish).toMatchObject({ valveLeakCheck: true, capFitted: true })
    // Opened again, the device knows it was sent: nothing waits.
    const again = await context.newPage()
    await again.goto(`${baseURL()}/device`)
    await expect.poll(() => again.getByTestId('queue').innerText()).toMatch(/Nothing waits/)
    await context.close()
  })
})

describe('Charge target with no signal', () => {
  it('answers on the device from the station copy it holds, with no fetch text anywhere', { timeout: 180_000 }, async () => {
    // Not opened online before: the page comes from the app shell, and its lists from the device's copy.
    const page = await readyForTheRamp()
    await page.context().setOffline(true)
    await page.goto('/charge-target')
    await expect.poll(() => page.getByTestId('connection').innerText()).toMatch(/Offline/)
    await expect.poll(() => page.getByTestId('device-copy').innerText()).toMatch(/your station's units as this device holds them/)
    await page.getByRole('button', { name: /QX-FMJ/ }).click()
    await page.getByRole('button', { name: /System 1/ }).click()
    await page.getByLabel(/Gas temperature/).fill('12')
    await expect.poll(() => page.getByTestId('target-value').innerText()).toMatch(/\d{3,}/)
    const at12 = Number((await page.getByTestId('target-value').innerText()).replace(/[^\d.]/g, ''))
    // Computed again on the device for the new temperature: a warmer gas needs a higher pre-charge.
    await page.getByLabel(/Gas temperature/).fill('30')
    await expect.poll(async () => Number((await page.getByTestId('target-value').innerText()).replace(/[^\d.]/g, '')))
      .toBeGreaterThan(at12)
    expect(await page.locator('body').innerText()).not.toMatch(/Failed to fetch|\[GET\]|<no response>/)
    await page.context().close()
  })
})

describe('the unit in front of you', () => {
  it('prints a label whose QR code opens the unit\'s page, and the start page finds a unit by its typed serial', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    const units = (await api('/api/accumulators?installed=true&pageSize=500', { cookie: await signIn(DEMO.technician) })).body.items as { id: number, serialNumber: string, aircraft: { registration: string }, position: string }[]
    const unit = units[3]!
    await page.goto(`/fleet/units/${unit.id}/label`)
    await expect.poll(() => page.getByTestId('unit-label').innerText()).toMatch(new RegExp(`S/N ${unit.serialNumber}`))
    const svg = await page.evaluate(url => fetch(url).then(response => response.text()), `/api/accumulators/${unit.id}/label`)
    expect(svg).toMatch(/^<svg/)
    await page.goto('/worksheets/new')
    await page.getByLabel('Serial number on the unit').fill(unit.serialNumber.toLowerCase())
    await page.getByRole('button', { name: 'Find' }).click()
    await expect.poll(() => page.getByRole('button', { name: new RegExp(unit.position.split(',')[0]!) }).getAttribute('aria-pressed')).toBe('true')
    await page.context().close()
  })
})
