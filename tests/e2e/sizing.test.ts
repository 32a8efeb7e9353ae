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

describe('a sizing study in a real browser', () => {
  it('an engineer links a specification, sees results per temperature and both plots, and saves the study', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/sizing/new')
    await page.getByLabel('Specification').selectOption({ label: 'FA-2240-01 rev B' })
    await expect.poll(() => page.getByLabel('Study name').inputValue()).toBe('FA-2240-01 rev B')
    await page.getByLabel(/Per application/).fill('2.5')
    await expect.poll(() => page.getByTestId('study-results').innerText(), { timeout: 15_000 }).toMatch(/Cold soak[\s\S]*Standard day[\s\S]*Hot day/)
    const cold = Number(await page.getByTestId('applications-Cold soak').innerText())
    const hot = Number(await page.getByTestId('applications-Hot day').innerText())
    expect(cold).toBeGreaterThan(0)
    expect(cold).toBeLessThanOrEqual(hot)
    await expect.poll(() => page.getByTestId('discharge-chart').locator('canvas').isVisible()).toBe(true)
    expect(await page.getByTestId('sweep-chart').locator('canvas').isVisible()).toBe(true)
    await page.getByRole('button', { name: 'Save study' }).click()
    await page.waitForURL(url => /\/sizing\/\d+$/.test(url.pathname))
    await page.goto('/sizing')
    await expect.poll(() => page.getByRole('link', { name: /FA-2240-01 rev B/ }).first().isVisible()).toBe(true)
    await page.context().close()
  })

  it('converts the pressures when the unit changes', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/sizing/new')
    await page.getByRole('button', { name: 'psi', exact: true }).click()
    await page.getByLabel('Maximum pressure').fill('3000')
    await page.getByRole('button', { name: 'bar', exact: true }).click()
    // Source: NIST SP 811 (2008) App. B.9, 1 psi = 6.894 757 kPa: 3000 psi = 206.843 bar, shown to 0.01 bar.
    await expect.poll(() => page.getByLabel('Maximum pressure').inputValue()).toBe('206.84')
    await page.context().close()
  })

  it('explains impossible limits in plain words', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/sizing/new')
    await expect.poll(() => page.getByTestId('study-results').isVisible(), { timeout: 15_000 }).toBe(true)
    const maximum = Number(await page.getByLabel('Maximum pressure').inputValue())
    await page.getByLabel('Minimum pressure').fill(String(maximum * 1.1))
    await expect.poll(() => page.getByTestId('study-error').innerText(), { timeout: 15_000 }).toMatch(/must be below the maximum/)
    // The results of the figures before are gone, not left under the impossible ones (stale-figure rule).
    expect(await page.getByTestId('study-results').count()).toBe(0)
    expect(await page.getByTestId('discharge-chart').count()).toBe(0)
    await page.getByLabel('Minimum pressure').fill(String(Math.round(maximum * 0.5)))
    await expect.poll(() => page.getByTestId('study-results').isVisible(), { timeout: 15_000 }).toBe(true)
    await page.context().close()
  })
})
