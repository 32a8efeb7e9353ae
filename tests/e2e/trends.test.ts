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

describe('trends in a real browser', () => {
  it('the fleet table puts the leaking unit first and flagged; its page plots the readings and the fit', async () => {
    const page = await signedInPage(browser, 'inspector@chargewell.test')
    await page.goto('/trends')
    const firstRow = page.getByTestId('trend-table').locator('tbody tr').first()
    await expect.poll(() => firstRow.innerText()).toMatch(/QX-FMC · Normal brake[\s\S]*Flagged/)
    expect(await page.getByTestId('cycle-flag').innerText()).toMatch(/QX-FMJ Hydraulic system 1[\s\S]*Check the accumulator's pre-charge first/)
    await expect.poll(() => page.getByTestId('cycle-chart').locator('canvas').isVisible()).toBe(true)
    // The chart's series are fetched once the page is live: the server-rendered page says it left them out.
    const html = await (await page.request.get('/trends')).text()
    expect(html).toContain('QX-FMJ')
    expect(html).toContain('seriesLeftOut')
    await firstRow.getByRole('link', { name: /QX-FMC/ }).first().click()
    await page.waitForURL(url => /\/trends\/units\/\d+$/.test(url.pathname))
    await expect.poll(() => page.getByTestId('unit-trend-chart').locator('canvas').isVisible()).toBe(true)
    expect(await page.getByTestId('unit-flag').innerText()).toMatch(/before the next scheduled check/)
    await page.context().close()
  })

  it('filters the ranking by base', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/trends')
    await page.getByLabel('Base').selectOption('Harlow Moor')
    await expect.poll(async () => (await page.getByTestId('trend-table').innerText()).includes('QX-FMC')).toBe(false)
    await page.context().close()
  })
})
