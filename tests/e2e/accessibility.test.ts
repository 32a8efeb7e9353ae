/**
 * Every page, for every role that can see it, on a tablet (1024×768) and a phone (390×844):
 * no serious or critical axe violation (@axe-core/playwright, WCAG 2.1 A and AA rules), no
 * horizontal overflow, and every row of a register table reached with the Tab key.
 */
import AxeBuilder from '@axe-core/playwright'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { navigationFor } from '../../shared/navigation'
import type { Role } from '../../shared/types/user'
import { launchBrowser, waitForHydration } from '../support/browser'
import { baseURL } from '../support/file-server'

const SIZES = { tablet: { width: 1024, height: 768 }, phone: { width: 390, height: 844 } } as const
const ACCOUNTS: [string, Role[]][] = [
  ['technician@chargewell.test', ['technician']],
  ['inspector@chargewell.test', ['inspector']],
  ['engineer@chargewell.test', ['engineer']],
  ['admin@chargewell.test', ['admin']],
]
/** Pages beyond the navigation, per role that reaches them. */
function detailPages(roles: Role[]): string[] {
  const pages = ['/', '/account', '/worksheets/1', '/fleet/units/1', '/fleet/units/1/label', '/specifications/1', '/tools/1',
    '/trends/units/1', '/device', '/api-reference']
  if (roles.includes('technician')) pages.push('/worksheets/new')
  if (roles.includes('engineer') || roles.includes('admin')) pages.push('/sizing/new')
  if (roles.includes('admin')) pages.push('/admin/outbox', '/admin/webhooks')
  return pages
}
/** Register tables whose rows open a record: each row must be reachable by keyboard. */
const ROW_TABLES = ['worksheets-table', 'aircraft-table', 'tool-table', 'specification-table', 'trend-table']

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

async function signedIn(
  email: string,
  viewport: { width: number, height: number },
): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ baseURL: baseURL(), viewport })
  const answer = await context.request.post('/api/auth/login', { data: { email, password: 'chargewell-demo' } })
  expect(answer.status()).toBe(200)
  return { context, page: waitForHydration(await context.newPage()) }
}

/** Tabs through the page and answers which rows of the table received focus. */
async function rowsReachedByTab(page: Page, testid: string): Promise<{ rows: number, reached: number }> {
  const rows = await page.getByTestId(testid).locator('tbody tr').count()
  await page.locator('body').focus()
  const reached = new Set<number>()
  for (let press = 0; press < rows * 2 + 120 && reached.size < rows; press++) {
    await page.keyboard.press('Tab')
    const row = await page.evaluate((id) => {
      const row = document.activeElement?.closest(`[data-testid="${id}"] tbody tr`)
      return row ? [...row.parentElement!.children].indexOf(row) : -1
    }, testid)
    if (row >= 0) reached.add(row)
  }
  return { rows, reached: reached.size }
}

describe.each(Object.entries(SIZES))('on a %s', (_size, viewport) => {
  it.each(ACCOUNTS)(
    '%s: every page passes axe, fits the screen, and its table rows take the keyboard',
    { timeout: 300_000 },
    async (email, roles) => {
      const { context, page } = await signedIn(email, viewport)
      const problems: string[] = []
      for (const path of [...navigationFor(roles).map(item => item.to), ...detailPages(roles)]) {
        const response = await page.goto(path, { waitUntil: 'networkidle' })
        expect(response?.status(), path).toBeLessThan(400)
        const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze()
        for (const violation of results.violations.filter(
          found => found.impact === 'serious' || found.impact === 'critical',
        )) {
          problems.push(
            `${path}: ${violation.impact} ${violation.id} at ${violation.nodes
              .slice(0, 3)
              .map(node => node.target.join(' '))
              .join(', ')}`,
          )
        }
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)
        if (overflow > 0) problems.push(`${path}: ${overflow} px wider than the screen`)
        for (const testid of ROW_TABLES) {
          if ((await page.getByTestId(testid).count()) === 0) continue
          const { rows, reached } = await rowsReachedByTab(page, testid)
          if (reached < rows) problems.push(`${path}: ${testid} rows reached by Tab: ${reached} of ${rows}`)
        }
      }
      expect(problems).toEqual([])
      await context.close()
    },
  )
})
