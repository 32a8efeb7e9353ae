/**
 * Signing with passkeys in real Chromium, its virtual authenticator standing in for the tablet's own
 * authenticator and for a security key (DevTools protocol WebAuthn.addVirtualAuthenticator): register,
 * sign, countersign, verify the PDF on the verify page, revoke.
 */
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { baseURL } from '../support/file-server'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

/** A page whose browser has an authenticator: the device's own (internal) or a security key (usb). */
async function withAuthenticator(email: string, transport: 'internal' | 'usb'): Promise<Page> {
  const page = await signedInPage(browser, email, undefined, { host: 'localhost' })
  const devtools = await page.context().newCDPSession(page)
  await devtools.send('WebAuthn.enable')
  await devtools.send('WebAuthn.addVirtualAuthenticator', {
    options: {
      protocol: 'ctap2',
      transport,
      hasResidentKey: true,
      hasUserVerification: true,
      isUserVerified: true,
      automaticPresenceSimulation: true,
    },
  })
  return page
}

async function registerPasskey(page: Page, name: string) {
  await page.goto('/account')
  await page.getByLabel('Name for the new passkey').fill(name)
  await page.getByTestId('add-passkey').click()
  await expect.poll(() => page.locator('section[aria-labelledby="passkeys-heading"]').innerText()).toContain(`“${name}” is registered`)
  await expect.poll(() => page.getByTestId('passkeys').innerText()).toContain(name)
}

async function worksheetReadyToSign(registration: string, position: RegExp): Promise<number> {
  const cookie = await signIn(DEMO.technician)
  const unit = await unitAt(cookie, registration, position)
  const flow = await fillWorksheet(cookie, unit.id)
  await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
  await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
  return flow.id
}

describe('passkeys in a real browser', () => {
  it('register, sign, countersign, verify the PDF, revoke', async () => {
    const technician = await withAuthenticator(DEMO.technician, 'usb')
    await registerPasskey(technician, 'Blue security key')
    // The same key twice: the browser refuses it, and the page says so (nothing registered twice).
    await technician.getByLabel('Name for the new passkey').fill('Blue key again')
    await technician.getByTestId('add-passkey').click()
    await expect.poll(() => technician.locator('section[aria-labelledby="passkeys-heading"] [role="status"]').innerText())
      .toMatch(/already registered/)
    expect(await technician.getByTestId('passkeys').locator('li').count()).toBe(1)

    const id = await worksheetReadyToSign('QX-FMA', /Emergency brake/)
    await technician.goto(`/worksheets/${id}`)
    await technician.getByTestId('certify').click()
    await technician.getByTestId('sign-with-passkey').click()
    await expect.poll(() => technician.getByTestId('state-badge').first().innerText()).toMatch(/Awaiting countersign/)

    const inspector = await withAuthenticator(DEMO.inspector, 'internal')
    await registerPasskey(inspector, 'Hangar tablet 3')
    await inspector.goto(`/worksheets/${id}`)
    const panel = inspector.getByTestId('countersign-panel')
    await panel.getByTestId('certify').click()
    await panel.getByTestId('sign-with-passkey').click()
    await expect.poll(() => inspector.getByTestId('state-badge').first().innerText()).toMatch(/Released/)
    await expect.poll(() => inspector.getByTestId('worksheet-record').innerText()).toMatch(/Signed with a passkey, key [0-9a-f]{4} /)

    // The PDF, dropped on the verify page (no account needed there).
    const pdf = await fetch(`${baseURL()}/api/worksheets/${id}/pdf`, { headers: { cookie: await signIn(DEMO.engineer) } })
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-e2e-')), `record-${id}.pdf`)
    writeFileSync(file, Buffer.from(await pdf.arrayBuffer()))
    const auditor = await browser.newPage({ baseURL: baseURL() })
    // Checked in the auditor's browser: the file is not sent anywhere.
    const sent: string[] = []
    auditor.on('request', request => request.method() === 'POST' && sent.push(request.url()))
    await auditor.goto('/verify')
    await auditor.locator('html[data-hydrated]').waitFor({ state: 'attached' })
    await auditor.getByTestId('record-file').setInputFiles(file)
    const report = auditor.getByTestId('verification')
    await expect.poll(() => report.getAttribute('data-ok'), { timeout: 20_000 }).toBe('true')
    expect(await report.locator('[data-status="valid"]').count()).toBe(2)
    expect(sent).toEqual([])
    expect(await report.innerText()).toMatch(/key [0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4} “Blue security key”/)

    // Revoked: listed as such, and the next signature is offered the password only.
    await technician.goto('/account')
    await technician.getByTestId('passkeys').getByRole('button', { name: 'Revoke' }).click()
    await technician.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => technician.getByTestId('passkeys').locator('li').first().getAttribute('data-revoked')).toBe('true')
    const next = await worksheetReadyToSign('QX-FMA', /Normal brake/)
    await technician.goto(`/worksheets/${next}`)
    await technician.getByLabel('Your password, to sign').waitFor()
    expect(await technician.getByTestId('sign-with-passkey').count()).toBe(0)
    const answer = await api(`/api/worksheets/${next}/signing-options?capacity=performer`, { cookie: await signIn(DEMO.technician) })
    expect(answer.body.passkey).toBeNull()
    await auditor.close()
  })

  it('the administrator chooses how each role signs and sees the key register of each user', async () => {
    const admin = await signedInPage(browser, DEMO.admin)
    await admin.goto('/admin')
    await admin.getByTestId('signing-performer-passkey').check()
    await admin.getByRole('button', { name: 'Save how each role signs' }).click()
    await expect.poll(() => admin.locator('section[aria-labelledby="signing-policy-heading"]').innerText()).toMatch(/Saved/)
    // The technician's register: the key revoked in the test before, with both its times.
    await admin.getByTestId(`user-${DEMO.technician}`).getByRole('button', { name: 'Passkeys' }).click()
    const register = admin.getByRole('region', { name: 'Passkeys of Rowan Hale' })
    await expect.poll(() => register.innerText()).toMatch(/Blue security key[\s\S]*revoked[\s\S]*Key [0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4} [0-9a-f]{4}/)

    // A technician with no usable passkey is told where to register one; no password field is offered.
    const technician = await signedInPage(browser, DEMO.technician)
    const id = await worksheetReadyToSign('QX-FMC', /Normal brake/)
    await technician.goto(`/worksheets/${id}`)
    await expect.poll(() => technician.getByTestId('passkey-needed').innerText()).toMatch(/register one on your account page/)
    expect(await technician.getByLabel('Your password, to sign').count()).toBe(0)

    await admin.getByTestId('signing-performer-either').check()
    await admin.getByRole('button', { name: 'Save how each role signs' }).click()
    await expect.poll(async () => (await api('/api/admin/signing-policy', { cookie: await signIn(DEMO.admin) })).body.performer).toBe('either')
  })
})
