/**
 * What a tablet downloads: the JavaScript each main page loads, gzipped (compressed here with
 * zlib, so the figure does not depend on what the server picked), against its budget; chart
 * code only where a chart is shown; static files served compressed.
 */
import { gzipSync } from 'node:zlib'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, waitForHydration } from '../support/browser'
import { baseURL } from '../support/file-server'

const KB = 1024
/** Per-page budgets of gzipped JavaScript (issue 11: Charge target ≤ 150 KB). */
const BUDGETS: [string, string, number][] = [
  ['/charge-target', 'Charge target', 150 * KB],
  ['/worksheets', 'Worksheets', 150 * KB],
  ['/', 'Good to see you', 130 * KB],
]

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})

/** A signed-in page with nothing cached: signed in by API, so no page has loaded yet. */
async function coldPage(): Promise<Page> {
  const context = await browser.newContext({ baseURL: baseURL() })
  const answer = await context.request.post('/api/auth/login', { data: { email: 'engineer@chargewell.test', password: 'chargewell-demo' } })
  expect(answer.status()).toBe(200)
  return waitForHydration(await context.newPage())
}
afterAll(async () => {
  await browser?.close()
})

async function scriptsOf(page: Page, path: string, heading: string) {
  const scripts = new Map<string, Buffer>()
  const listener = async (response: import('playwright-core').Response) => {
    if (response.request().resourceType() === 'script' && response.ok()) scripts.set(response.url(), await response.body().catch(() => Buffer.alloc(0)))
  }
  page.on('response', listener)
  await page.goto(path, { waitUntil: 'networkidle' })
  await page.getByRole('heading', { level: 1 }).filter({ hasText: heading }).first().waitFor()
  page.off('response', listener)
  return scripts
}

describe('JavaScript per page', () => {
  it.each(BUDGETS)('%s ("%s") stays within %d bytes gzipped', async (path, heading, budget) => {
    const page = await coldPage()
    const scripts = await scriptsOf(page, path, heading)
    const gzipped = [...scripts.values()].reduce((total, body) => total + gzipSync(body, { level: 9 }).length, 0)
    console.info(`${path}: ${scripts.size} scripts, ${(gzipped / KB).toFixed(1)} KB gzipped`)
    expect(gzipped).toBeLessThanOrEqual(budget)
    await page.context().close()
  })

  it('loads chart code only on pages that show a chart', async () => {
    // uPlot's own class for the plot's overlay.
    const hasChart = (scripts: Map<string, Buffer>) => [...scripts.values()].some(body => body.includes('u-over'))
    const worksheets = await coldPage()
    expect(hasChart(await scriptsOf(worksheets, '/worksheets', 'Worksheets'))).toBe(false)
    await worksheets.context().close()
    // Charge target plots nothing until there is a target; Trends plots the pump cycles at once.
    const chargeTarget = await coldPage()
    expect(hasChart(await scriptsOf(chargeTarget, '/charge-target', 'Charge target'))).toBe(false)
    await chargeTarget.context().close()
    const trends = await coldPage()
    expect(hasChart(await scriptsOf(trends, '/trends', 'Trends'))).toBe(true)
    await trends.context().close()
  })

  it('serves static files compressed to a browser that accepts it', async () => {
    const html = await (await fetch(`${baseURL()}/login`)).text()
    const script = html.match(/src="(\/_nuxt\/[^"]+\.js)"/)![1]!
    const response = await fetch(`${baseURL()}${script}`, { headers: { 'accept-encoding': 'br, gzip' } })
    expect(response.headers.get('content-encoding')).toMatch(/br|gzip/)
  })
})
