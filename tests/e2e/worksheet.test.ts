import { execFileSync } from 'node:child_process'
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

async function startWorksheet(page: Page, registration: RegExp, position: RegExp, workOrder: string): Promise<number> {
  await page.goto('/worksheets')
  await page.getByRole('link', { name: 'New worksheet' }).click()
  await page.getByRole('button', { name: registration }).click()
  await page.getByRole('button', { name: position }).click()
  await page.getByLabel('Work order').fill(workOrder)
  await page.getByRole('button', { name: 'Start worksheet' }).click()
  await page.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))
  return Number(new URL(page.url()).pathname.split('/').pop())
}

async function confirmPreparation(page: Page) {
  const checks = ['systemDepressurised', 'aircraftSafe', 'eyeProtection', 'nitrogenOnly']
  for (const check of checks.slice(0, -1)) {
    await page.getByTestId(`confirm-${check}`).click()
    await expect.poll(() => page.getByTestId(`confirm-${check}`).getAttribute('aria-pressed')).toBe('true')
  }
  // The last confirmation completes the step, and the worksheet moves on to the tools.
  await page.getByTestId(`confirm-${checks.at(-1)}`).click()
  await expect.poll(() => page.getByRole('heading', { name: '2 · Tools' }).isVisible()).toBe(true)
}

describe('the servicing worksheet in a real browser', () => {
  it('technician fills and signs; the inspector is e-mailed, countersigns; the PDF holds the readings', async () => {
    const technician = await signedInPage(browser, 'technician@chargewell.test')
    const id = await startWorksheet(technician, /QX-FMB/, /Normal brake/, 'WO-E2E-0001')
    await confirmPreparation(technician)
    // The expired gauge is shown, with why, and cannot be picked.
    expect(await technician.getByRole('button', { name: /GA-0098/ }).isDisabled()).toBe(true)
    expect(await technician.getByRole('button', { name: /GA-0098/ }).innerText()).toMatch(/Calibration expired/)
    await technician.getByRole('button', { name: /NC-07/ }).click()
    await technician.getByRole('button', { name: /GA-0141(?!B)/ }).click()
    await technician.getByRole('button', { name: 'Save and continue' }).click()

    await technician.getByLabel(/Gas temperature/).fill('12')
    await technician.getByLabel(/Minutes since/).fill('60')
    await technician.getByRole('button', { name: 'Save and continue' }).click()
    await technician.getByLabel(/As-found reading/).fill('955')
    await technician.getByRole('button', { name: 'Record as-found' }).click()
    await expect.poll(() => technician.getByTestId('result-as-found').innerText()).toMatch(/In limits/)
    await technician.getByRole('button', { name: 'Next: Action' }).click()
    await technician.getByRole('button', { name: /No action/ }).click()
    await technician.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => technician.getByLabel(/As-left reading/).inputValue()).toBe('955')
    await technician.getByRole('button', { name: 'Record as-left' }).click()
    await expect.poll(() => technician.getByTestId('result-as-left').innerText()).toMatch(/In limits/)
    await technician.getByRole('button', { name: 'Next: Finish' }).click()
    await technician.getByRole('button', { name: /Charging valve leak-checked/ }).click()
    await technician.getByRole('button', { name: /Valve cap refitted/ }).click()
    await technician.getByRole('button', { name: 'Save and continue' }).click()
    await technician.getByTestId('certify').click()
    await technician.getByLabel('Your password, to sign').fill('chargewell-demo')
    await technician.getByRole('button', { name: 'Sign worksheet' }).click()
    await expect.poll(() => technician.getByTestId('state-badge').first().innerText()).toMatch(/Awaiting countersign/)
    await technician.context().close()

    // The inspector's e-mail, as the local fake SMTP server received it.
    const admin = await signedInPage(browser, 'admin@chargewell.test')
    // Sent from the outbox in the background: wait for it to arrive.
    await expect.poll(async () => {
      const outbox = await admin.evaluate(() => fetch('/api/admin/outbox').then(response => response.json()))
      const mail = outbox.received.find((message: { to: string[], subject: string }) => message.to.includes('inspector@chargewell.test') && message.subject.startsWith(`Worksheet ${id} awaits countersign`))
      return mail?.text ?? ''
    }, { timeout: 15_000 }).toContain(`/worksheets/${id}`)
    await admin.context().close()

    const inspector = await signedInPage(browser, 'inspector@chargewell.test')
    await inspector.goto('/countersign')
    await inspector.getByTestId('countersign-queue').getByRole('link', { name: new RegExp(`Worksheet ${id}`) }).click()
    await expect.poll(() => inspector.getByTestId('worksheet-record').innerText()).toMatch(/As-found: 955\.0 psig/)
    const panel = inspector.getByTestId('countersign-panel')
    await panel.getByTestId('certify').click()
    await panel.getByLabel('Your password, to sign').fill('chargewell-demo')
    await panel.getByRole('button', { name: 'Countersign and release' }).click()
    await expect.poll(() => inspector.getByTestId('state-badge').first().innerText()).toMatch(/Released/)

    const [download] = await Promise.all([inspector.waitForEvent('download'), inspector.getByTestId('download-pdf').click()])
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-e2e-')), 'record.pdf')
    await download.saveAs(file)
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
    expect(text).toContain(`Worksheet ${id}`)
    expect(text).toContain('State: Released')
    expect(text).toMatch(/As-found: 955\.0 psig at 12\.0 °C — IN LIMITS/)
    expect(text).toMatch(/As-left: 955\.0 psig/)
    expect(text).toContain('Performed by Rowan Hale')
    expect(text).toContain('Independent inspection by Imke Dorsey')
    await inspector.context().close()
  })

  it('a reload mid-worksheet finds every entered field still there', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    const id = await startWorksheet(page, /QX-FMK/, /System 2/, 'WO-E2E-RELOAD')
    await confirmPreparation(page)
    await page.getByRole('button', { name: /GA-0152/ }).click()
    await page.getByRole('button', { name: /NC-11/ }).click()
    await page.getByRole('button', { name: 'Save and continue' }).click()
    // Typed but not saved yet:
    await page.getByLabel(/Gas temperature/).fill('-7.5')
    await page.getByLabel(/Minutes since/).fill('240')
    await page.getByRole('button', { name: 'On the shell' }).click()
    await page.reload()
    expect(new URL(page.url()).pathname).toBe(`/worksheets/${id}`)
    await expect.poll(() => page.getByLabel(/Gas temperature/).inputValue()).toBe('-7.5')
    expect(await page.getByLabel(/Minutes since/).inputValue()).toBe('240')
    expect(await page.getByRole('button', { name: 'On the shell' }).getAttribute('aria-pressed')).toBe('true')
    // And what was saved is on the server.
    const saved = await page.evaluate(worksheetId => fetch(`/api/worksheets/${worksheetId}`).then(response => response.json()), id)
    expect(saved.content.tools.gauge.assetNumber).toBe('GA-0152')
    expect(Object.keys(saved.content.preparation)).toHaveLength(4)
    await page.getByRole('button', { name: /Tools/ }).click()
    expect(await page.getByRole('button', { name: /GA-0152/ }).getAttribute('aria-pressed')).toBe('true')
    await page.context().close()
  })

  it('keeps a step typed while offline and sends it when the connection returns', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    const id = await startWorksheet(page, /QX-FML/, /System 1/, 'WO-E2E-OFFLINE')
    await confirmPreparation(page)
    await page.context().setOffline(true)
    await page.getByRole('button', { name: /GA-0141(?!B)/ }).click()
    await page.getByRole('button', { name: /NC-07/ }).click()
    await page.getByRole('button', { name: 'Save and continue' }).click()
    await expect.poll(() => page.getByTestId('step-message').innerText()).toMatch(/saved on this device/)
    await page.context().setOffline(false)
    await expect.poll(async () => (await page.evaluate(worksheetId => fetch(`/api/worksheets/${worksheetId}`).then(response => response.json()), id)).content.tools?.gauge.assetNumber, { timeout: 15_000 }).toBe('GA-0141')
    await page.context().close()
  })
})
