/**
 * The register of certifying authorisations in real Chromium: the administrator suspends an inspector's
 * authorisation with a reason, and the inspector's countersign form says why before anything is tapped;
 * each holder sees what they may certify on their account page.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('certifying authorisations in a real browser', () => {
  it('a suspension is said on the countersign form; the holder sees their register entry', async () => {
    const technician = await signIn(DEMO.technician)
    const unit = await unitAt(technician, 'QX-FMC', /Emergency brake/)
    const flow = await fillWorksheet(technician, unit.id)
    await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
    expect((await api(`/api/worksheets/${flow.id}/sign`, { cookie: technician, body: { certify: true, password: DEMO_PASSWORD } })).status).toBe(200)

    const admin = await signedInPage(browser, DEMO.admin)
    await admin.goto('/admin')
    const entry = admin.getByTestId('authorisation-register').locator('li[data-number="FMR-I-0107"]')
    await entry.getByLabel('Reason to suspend FMR-I-0107').fill('Recurrent training overdue')
    await entry.getByRole('button', { name: 'Suspend' }).click()
    await expect.poll(() => entry.innerText()).toMatch(/suspended: Recurrent training overdue/)

    const inspector = await signedInPage(browser, DEMO.inspector)
    await inspector.goto(`/worksheets/${flow.id}`)
    await expect.poll(() => inspector.getByTestId('signing-refused').innerText())
      .toMatch(/Your authorisation FMR-I-0107 is suspended: Recurrent training overdue\. The signature was not made\./)
    await inspector.goto('/account')
    await expect.poll(() => inspector.getByTestId('my-authorisations').innerText()).toMatch(/FMR-I-0107 · Inspect and countersign[\s\S]*suspended/)

    await entry.getByRole('button', { name: 'Reinstate' }).click()
    await expect.poll(() => entry.innerText()).not.toMatch(/suspended:/)
    await inspector.goto(`/worksheets/${flow.id}`)
    const panel = inspector.getByTestId('countersign-panel')
    await panel.getByTestId('certify').click()
    await panel.getByLabel('Your password, to sign').fill(DEMO_PASSWORD)
    await panel.getByRole('button', { name: 'Countersign and release' }).click()
    await expect.poll(() => inspector.getByTestId('state-badge').first().innerText()).toMatch(/Released/)
  })
})
