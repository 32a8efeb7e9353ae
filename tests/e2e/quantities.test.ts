/**
 * Every figure right at the glass: one quantity input on every page. A unit switch converts what was
 * entered (never reinterprets it), a comma decimal is a decimal in any locale, empty is never zero, an
 * out-of-range reading is refused on its field in the unit on screen, and the figure shown is the
 * engine's for the inputs on screen.
 */
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { chargeTarget } from '../../shared/gas/charge-target'
import { formatPressureValue } from '../../shared/gas/format'
import type { PressureUnit } from '../../shared/gas/types'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const gasTemperature = (page: Page) => page.getByLabel(/^Gas temperature/)
const gaugeUnit = (page: Page, unit: string) =>
  page.getByRole('group', { name: 'Gauge unit' }).getByRole('button', { name: unit, exact: true })

async function normalBrake(page: Page) {
  await page.goto('/charge-target')
  await page.getByRole('button', { name: /QX-FMC/ }).click()
  await page.getByRole('button', { name: /Normal brake/ }).click()
}

describe('the charge target at the glass', () => {
  it('a gauge-unit switch converts the as-found reading; a reading above the unit\'s maximum is refused on its field', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await normalBrake(page)
    await gaugeUnit(page, 'psi').click()
    await gasTemperature(page).fill('50')
    await page.getByLabel(/As-found reading/).fill('1000')
    await expect.poll(() => page.getByTestId('verdict').isVisible()).toBe(true)
    await gaugeUnit(page, 'bar').click()
    // 1000 psi is 68.95 bar (NIST SP 811, B.8: 1 psi = 6894.757 Pa): the reading keeps its physical value.
    await expect.poll(() => page.getByLabel(/As-found reading/).inputValue()).toBe('68.95')
    expect(await page.getByTestId('verdict').innerText()).not.toMatch(/919/)
    // Typed in bar, 1000 is above the unit's 3000 psig: refused on the field, in bar, with no verdict.
    await page.getByLabel(/As-found reading/).fill('1000')
    const field = page.getByTestId('as-found-field')
    await expect.poll(() => field.innerText())
      .toMatch(/Above the unit's maximum working pressure, 206\.84 bar gauge \(3000 psig\): that is system pressure/)
    expect(await page.getByTestId('verdict').count()).toBe(0)
    await page.context().close()
  })

  it('reads 2,5 as 2.5 °C with the browser in de-DE, and −2,5 with the ± key; the figure is the one for 2.5', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test', undefined, { locale: 'de-DE' })
    await normalBrake(page)
    const target = page.getByTestId('target-value')
    await gasTemperature(page).fill('2.5')
    await expect.poll(() => page.getByTestId('charge-result').innerText()).toMatch(/Target at 2\.5 °C/i)
    const withPoint = await target.innerText()
    await gasTemperature(page).fill('25')
    await expect.poll(() => target.innerText()).not.toBe(withPoint)
    await gasTemperature(page).fill('2,5')
    await expect.poll(() => page.getByTestId('charge-result').innerText()).toMatch(/Target at 2\.5 °C/i)
    expect(await target.innerText()).toBe(withPoint)
    await page.getByTestId('gas-temperature-field').getByRole('button', { name: /Change the sign/ }).click()
    await expect.poll(() => page.getByTestId('charge-result').innerText()).toMatch(/Target at -2\.5 °C/i)
    // An entry that reads two ways is refused, with no figure.
    await gasTemperature(page).fill('1.234,5')
    await expect.poll(() => page.getByTestId('gas-temperature-field').innerText()).toMatch(/without a thousands separator/)
    expect(await target.count()).toBe(0)
    await page.context().close()
  })

  it('after gauge-unit switches by hand, the target shown is the engine\'s for the figures on screen', async () => {
    const page = await signedInPage(browser, 'inspector@chargewell.test')
    await page.goto('/charge-target')
    await page.getByRole('button', { name: 'By hand' }).click()
    await gaugeUnit(page, 'psi').click()
    await page.getByLabel(/^Reference pre-charge/).fill('1000')
    await page.getByLabel(/At temperature/).fill('21')
    await gasTemperature(page).fill('0')
    for (const unit of ['bar', 'kPa', 'MPa', 'psi', 'bar'] as PressureUnit[]) {
      await gaugeUnit(page, unit).click()
      await expect.poll(() => page.getByTestId('target-value').innerText()).toContain(unit === 'psi' ? 'psig' : unit)
      const shown = Number((await page.getByLabel(/^Reference pre-charge/).inputValue()).replace(',', '.'))
      const expected = chargeTarget({
        reference: { pressure: { value: shown, unit, basis: 'gauge' }, temperature: { value: 21, unit: 'C' } },
        gasTemperature: { value: 0, unit: 'C' },
      }).target.value
      await expect.poll(() => page.getByTestId('target-value').innerText()).toContain(formatPressureValue(expected, unit))
    }
    await page.context().close()
  })
})

describe('sizing at the glass', () => {
  it('an emptied condition temperature is refused on its field, never computed at zero', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/sizing/new')
    await page.getByLabel('Specification').selectOption({ label: 'FA-2240-01 rev B' })
    await page.getByLabel(/Per application/).fill('2.5')
    await expect.poll(() => page.getByTestId('study-results').innerText(), { timeout: 15_000 }).toMatch(/Cold soak/)
    await page.getByLabel('Condition 1 temperature').fill('')
    const row = page.getByTestId('condition-1-field')
    await expect.poll(() => row.innerText()).toMatch(/Enter the temperature of this condition/)
    await expect.poll(() => page.getByTestId('study-results').count()).toBe(0)
    // Typed with a comma, it counts again.
    await page.getByLabel('Condition 1 temperature').fill('-40,0')
    await expect.poll(() => page.getByTestId('study-results').innerText(), { timeout: 15_000 }).toMatch(/Cold soak/)
    await page.context().close()
  })
})
