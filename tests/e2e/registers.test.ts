import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('registers in a real browser', () => {
  it('flags the expired gauge, and filters to it', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/tools')
    await expect.poll(() => page.getByTestId('tool-table').innerText()).toMatch(/GA-0098[\s\S]*Expired/)
    await page.getByLabel('Calibration').selectOption('expired')
    await expect.poll(async () => (await page.getByTestId('tool-table').locator('tbody tr').count())).toBe(1)
    await page.context().close()
  })

  it('an admin imports aircraft from CSV: a bad row is reported by line and nothing is imported', async () => {
    const page = await signedInPage(browser, 'admin@chargewell.test')
    await page.goto('/fleet')
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-csv-')), 'aircraft.csv')
    writeFileSync(file, 'registration,fleetNumber,type,base,active\nQX-FNA,781,Tarnwing 72,Skelby,true\nQX FN B!,782,Tarnwing 72,Skelby,true\n')
    await page.getByText('Import or export aircraft (CSV)').click()
    await page.getByLabel('CSV file').setInputFiles(file)
    await expect.poll(() => page.getByTestId('import-report').innerText()).toMatch(/Nothing was imported[\s\S]*3\s+registration\s+Letters, digits and hyphens only/)
    await page.getByLabel('Search').fill('QX-FNA')
    await expect.poll(() => page.locator('body').innerText()).toMatch(/No aircraft match/)

    // Corrected, the file is previewed — a new aircraft, and QX-FMB's edited base — and applied on request.
    writeFileSync(file, 'registration,fleetNumber,type,base,active\nQX-FNA,781,Tarnwing 72,Skelby,true\nQX-FMB,462,Tarnwing 46,Skelby,true\n')
    await page.getByLabel('CSV file').setInputFiles(file)
    const preview = page.getByTestId('import-preview')
    await expect.poll(() => preview.innerText()).toMatch(/1 to add · 1 to change[\s\S]*QX-FMB:\s*base Harlow Moor → Skelby/)
    await preview.getByRole('button', { name: 'Apply 2 change(s)' }).click()
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Imported:' }).innerText()).toMatch(/1 added, 1 changed/)
    await page.getByLabel('Search').fill('QX-FNA')
    await expect.poll(() => page.getByTestId('aircraft-table').innerText()).toMatch(/QX-FNA/)
    await page.context().close()
  })

  it('an engineer opens the table specification and sees its approved-data points and revisions', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/specifications')
    await page.getByTestId('specification-table').getByText('FJ-3310-05').click()
    await page.waitForURL(url => /\/specifications\/\d+$/.test(url.pathname))
    await expect.poll(() => page.locator('main').innerText()).toMatch(/Approved-data table[\s\S]*-40 °C[\s\S]*1170 psi/)
    expect(await page.getByRole('button', { name: 'Issue a new revision' }).isVisible()).toBe(true)
    await page.context().close()
  })
})
