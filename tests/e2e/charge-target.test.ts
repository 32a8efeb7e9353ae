import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { chargeTarget } from '../../shared/gas/charge-target'
import { formatPressureValue } from '../../shared/gas/format'
import { signIn } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { baseURL } from '../support/file-server'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('Charge target page', () => {
  it('gives the target for an installed unit, the verdict of an as-found reading, the plot and the cautions', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/charge-target')
    await page.getByRole('button', { name: /QX-FMC/ }).click()
    await page.getByRole('button', { name: /Normal brake/ }).click()
    await expect.poll(() => page.getByTestId('specification-summary').innerText()).toMatch(/FA-2240-01 rev B/)

    await page.getByLabel(/Gas temperature/).fill('0')
    // The demo specification FA-2240-01: 1000 psig at 21 °C, −5/+5 %, real gas; the technician's station is at 420 ft.
    const expected = chargeTarget({
      reference: { pressure: { value: 1000, unit: 'psi', basis: 'gauge' }, temperature: { value: 21, unit: 'C' } },
      gasTemperature: { value: 0, unit: 'C' },
      ambient: { elevation: { value: 420, unit: 'ft' } },
      tolerance: { minus: 5, plus: 5, unit: '%' },
    })
    await expect.poll(() => page.getByTestId('target-value').innerText()).toContain(formatPressureValue(expected.target.value, 'psi'))
    expect(await page.getByTestId('band').innerText()).toContain(formatPressureValue(expected.low!.value, 'psi'))

    await page.getByLabel(/As-found reading/).fill('850')
    await expect.poll(() => page.getByTestId('verdict').innerText()).toMatch(/Low[\s\S]*Below the band by/)
    await page.getByLabel(/As-found reading/).fill(String(Math.round(expected.target.value)))
    await expect.poll(() => page.getByTestId('verdict').innerText()).toMatch(/In limits/)

    await expect.poll(() => page.getByTestId('charge-chart').locator('canvas').isVisible()).toBe(true)
    expect(await page.getByTestId('cautions').innerText()).toMatch(/never oxygen or shop air/)
    expect(await page.getByTestId('charge-result').innerText()).toMatch(/Span et al\. 2000/)
    await page.context().close()
  })

  it('shows the approved-data table for a table specification, and refuses a temperature outside it', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/charge-target')
    await page.getByRole('button', { name: 'Specification', exact: true }).click()
    await page.getByLabel('Specification').selectOption({ label: 'FJ-3310-05 rev D — System accumulator, Tarnwing 72' })
    await page.getByLabel(/Gas temperature/).fill('10')
    // Invented demo table: 1390 psig at 0 °C, 1500 psig at 20 °C → 1445 psig at 10 °C.
    await expect.poll(() => page.getByTestId('target-value').innerText()).toContain('1445.0')
    expect(await page.getByTestId('approved-table').innerText()).toMatch(/-40/)
    await page.getByLabel(/Gas temperature/).fill('65')
    await expect.poll(() => page.getByTestId('charge-error').innerText()).toMatch(/outside the approved-data table/)
    await page.context().close()
  })

  it('works by hand in the gauge unit the user picks (bar)', async () => {
    const page = await signedInPage(browser, 'inspector@chargewell.test')
    await page.goto('/charge-target')
    await page.getByRole('button', { name: 'By hand' }).click()
    await page.getByRole('group', { name: 'Gauge unit' }).getByRole('button', { name: 'bar' }).click()
    await page.getByLabel(/^Reference pre-charge/).fill('100')
    await page.getByLabel(/At temperature/).fill('20')
    await page.getByLabel('Tolerance −').fill('3')
    await page.getByLabel('Tolerance +').fill('3')
    await page.getByLabel(/Gas temperature/).fill('20')
    await expect.poll(() => page.getByTestId('target-value').innerText()).toMatch(/100\.00\s*bar gauge/)
    await page.context().close()
  })

  it('shows no figure under invalid inputs: a gas temperature of −300 or 150 °C, or 99,999 psi by hand (stale-figure rule)', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/charge-target')
    await page.getByRole('button', { name: /QX-FMC/ }).click()
    await page.getByRole('button', { name: /Normal brake/ }).click()
    await page.getByLabel(/Gas temperature/).fill('15')
    await expect.poll(() => page.getByTestId('target-value').isVisible()).toBe(true)
    for (const temperature of ['-300', '150']) {
      await page.getByLabel(/Gas temperature/).fill(temperature)
      // The refusal is shown under the gas temperature; no target, band or plot remains from 15 °C.
      await expect.poll(() => page.getByTestId('gas-temperature-field').locator('.field-error').innerText()).not.toBe('')
      expect(await page.getByTestId('target-value').count()).toBe(0)
      expect(await page.getByTestId('band').count()).toBe(0)
      expect(await page.getByTestId('charge-chart').count()).toBe(0)
    }
    // Clearing the optional as-found reading leaves a working calculator.
    await page.getByLabel(/Gas temperature/).fill('10')
    await page.getByLabel(/As-found reading/).fill('900')
    await expect.poll(() => page.getByTestId('verdict').isVisible()).toBe(true)
    await page.getByLabel(/As-found reading/).fill('')
    await expect.poll(() => page.getByTestId('target-value').isVisible()).toBe(true)
    expect(await page.getByTestId('verdict').count()).toBe(0)
    await page.getByLabel(/Gas temperature/).fill('12')
    await expect.poll(() => page.getByTestId('charge-result').innerText()).toMatch(/Target at 12(\.0)? °C/i)

    await page.getByRole('button', { name: 'By hand' }).click()
    await page.getByLabel(/^Reference pre-charge/).fill('1000')
    await page.getByLabel(/At temperature/).fill('21')
    await expect.poll(() => page.getByTestId('target-value').isVisible()).toBe(true)
    await page.getByLabel(/^Reference pre-charge/).fill('99999')
    await expect.poll(() => page.getByTestId('charge-result').innerText()).not.toMatch(/Target at/i)
    expect(await page.getByTestId('target-value').count()).toBe(0)
    await page.context().close()
  })

  // Last in the file: it adds 510 aircraft to this file's database.
  it('finds an aircraft in a fleet larger than the page loads: a search box, and the register asked for the rest', async () => {
    const admin = await signIn('admin@chargewell.test')
    const post = async (path: string, csv: string) => {
      const response = await fetch(`${baseURL()}${path}`, { method: 'POST', headers: { 'content-type': 'text/csv', 'cookie': admin }, body: csv })
      expect(response.status, await response.text()).toBe(200)
    }
    const numbers = Array.from({ length: 510 }, (_, index) => String(index).padStart(3, '0'))
    await post('/api/aircraft/import', ['registration,fleetNumber,type,base',
      ...numbers.map(number => `QX-Z${number},Z${number},Tarnwing 72,Skelby`)].join('\n'))
    await post('/api/accumulators/import', ['partNumber,serialNumber,system,registration,position,installedAt',
      ...numbers.map(number => `FA-2240-01,SNZ${number},Brake system,QX-Z${number},Normal brake,2026-11-01`)].join('\n'))

    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/charge-target')
    // 531 units: the page holds the first 500 (by registration), so QX-Z509 is not among them.
    const search = page.getByTestId('aircraft-search')
    await expect.poll(() => page.getByRole('button', { name: /^QX-/ }).count()).toBeLessThanOrEqual(24)
    await search.fill('z509')
    await page.getByRole('button', { name: /QX-Z509/ }).click()
    await page.getByRole('button', { name: /Normal brake/ }).click()
    await expect.poll(() => page.getByTestId('specification-summary').innerText()).toMatch(/FA-2240-01 rev B/)
    await page.getByLabel(/Gas temperature/).fill('0')
    await expect.poll(() => page.getByTestId('target-value').innerText()).toMatch(/\d/)
    await page.context().close()
  })
})
