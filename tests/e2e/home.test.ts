/**
 * Home shows each user their work, not only links; a technician is told when the unit in front
 * of them is flagged; a draft can be discarded (after a question); a void asks first.
 */
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

describe('the work list on Home', () => {
  it('an inspector sees the worksheets awaiting their countersign and opens one', async () => {
    const page = await signedInPage(browser, 'inspector@chargewell.test')
    await expect.poll(() => page.getByTestId('work-summary').innerText()).toMatch(/\d+ awaiting your countersign/)
    const queue = page.getByTestId('work-to-countersign')
    await queue.getByRole('link', { name: /QX-/ }).first().click()
    await page.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))
    await expect.poll(() => page.getByTestId('countersign-panel').isVisible()).toBe(true)
    await page.context().close()
  })

  it('a technician starting on a flagged unit is told, sees the new draft on Home, and discards it after a question', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    const drafts = async () => Number((await page.getByTestId('work-drafts').getByRole('heading').innerText()).match(/^(\d+)/)?.[1] ?? 0)
    await expect.poll(() => page.getByTestId('work-drafts').isVisible()).toBe(true)
    const before = await drafts()
    await page.goto('/worksheets/new')
    await page.getByRole('button', { name: /QX-FMC/ }).click()
    await page.getByRole('button', { name: /Normal brake/ }).click()
    await expect.poll(() => page.getByTestId('unit-alerts').innerText()).toMatch(/The trends flag this unit[\s\S]*QX-FMC/)
    await page.getByLabel('Work order').fill(`WO-HOME-${Date.now()}`)
    await page.getByRole('button', { name: 'Start worksheet' }).click()
    await page.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))
    const id = Number(new URL(page.url()).pathname.split('/').pop())
    expect(await page.getByTestId('unit-alerts').isVisible()).toBe(true)
    await page.goto('/')
    await expect.poll(drafts).toBe(before + 1)

    await page.goto(`/worksheets/${id}`)
    await page.getByTestId('discard-panel').locator('summary').click()
    await page.getByLabel('Why (optional)').fill('Started to try the flag banner.')
    await page.getByRole('button', { name: 'Discard draft' }).click()
    // Cancelled: nothing happens.
    await page.getByRole('dialog').getByRole('button', { name: 'Cancel' }).click()
    expect(await page.getByTestId('state-badge').first().innerText()).toMatch(/Draft/)
    await page.getByRole('button', { name: 'Discard draft' }).click()
    await page.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => page.getByTestId('state-badge').first().innerText()).toMatch(/Voided/)
    await page.goto('/')
    await expect.poll(drafts).toBe(before)
    await page.context().close()
  })

  it('an admin voids a worksheet only after confirming, and sees the role changes they make in the audit view', async () => {
    const page = await signedInPage(browser, 'admin@chargewell.test')
    // A released record is never voided (a correction supersedes it): one awaiting countersign is.
    await page.goto('/worksheets?state=awaiting-countersign')
    await page.getByTestId('worksheets-table').getByRole('link').first().click()
    await page.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))
    await page.getByLabel('Reason').fill('Entered against the wrong aircraft by the planning office.')
    await page.getByRole('button', { name: 'Void worksheet' }).click()
    await expect.poll(() => page.getByRole('dialog').innerText()).toMatch(/Void this worksheet\?/)
    await page.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => page.getByTestId('state-badge').first().innerText()).toMatch(/Voided/)

    await page.goto('/admin')
    const row = page.getByTestId('user-engineer@chargewell.test')
    await row.getByRole('button', { name: /Inspector role for Sol Varga/ }).click()
    await expect.poll(() => page.getByRole('dialog').innerText()).toMatch(/Give the inspector role\?[\s\S]*signed out everywhere/)
    await page.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => page.getByTestId('audit-log').innerText()).toMatch(/Nell Abara changed the roles of Sol Varga from Engineer to Engineer, Inspector/)
    await row.getByRole('button', { name: /Inspector role for Sol Varga/ }).click()
    await page.getByRole('dialog').getByTestId('confirm-yes').click()
    await expect.poll(() => page.getByTestId('audit-log').innerText()).toMatch(/from Engineer, Inspector to Engineer/)
    await page.context().close()
  })
})

describe('sizing against a requirement', () => {
  it('gives a verdict against the required applications, and asks before leaving unsaved edits', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.goto('/sizing/new')
    await page.getByLabel('Specification').selectOption({ label: 'FA-2240-01 rev B' })
    await page.getByLabel(/Per application/).fill('2.5')
    await page.getByLabel('Required applications').fill('500')
    await expect.poll(() => page.getByTestId('study-verdict').innerText(), { timeout: 15_000 }).toMatch(/Short of 500 full applications at Cold soak/)
    await page.getByLabel('Required applications').fill('1')
    await expect.poll(() => page.getByTestId('study-verdict').innerText(), { timeout: 15_000 }).toMatch(/Meets the requirement/)
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Trends' }).click()
    await expect.poll(() => page.getByRole('dialog').innerText()).toMatch(/Leave without saving\?/)
    await page.getByRole('dialog').getByRole('button', { name: 'Cancel' }).click()
    expect(new URL(page.url()).pathname).toBe('/sizing/new')
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Trends' }).click()
    await page.getByRole('dialog').getByTestId('confirm-yes').click()
    await page.waitForURL(url => url.pathname === '/trends')
    await page.context().close()
  })
})

describe('pump cycle checks', () => {
  it('shows no problem before anything is done, refuses a 99,999-minute interval on its field, and corrects a check', async () => {
    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/trends')
    const form = page.getByTestId('cycle-check-form')
    await expect.poll(() => form.isVisible()).toBe(true)
    expect(await form.innerText()).not.toMatch(/Pick the aircraft/)
    await form.getByLabel('Aircraft and system').selectOption({ label: 'QX-FMA · Hydraulic system A' })
    await form.getByLabel(/^Interval/).fill('99999')
    await form.getByLabel(/Fluid temperature/).fill('40')
    await form.getByRole('button', { name: 'Record check' }).click()
    await expect.poll(() => form.innerText()).toMatch(/A cut-out to cut-in interval is between 0\.0833 and 1440 min/)
    await form.getByLabel(/^Interval/).fill('6.5')
    await form.getByRole('button', { name: 'Record check' }).click()
    await expect.poll(() => form.innerText()).toMatch(/Recorded\. Implied leak rate/)
    const list = page.getByTestId('cycle-check-list')
    await expect.poll(() => list.getByRole('button', { name: /^Correct/ }).first().isVisible()).toBe(true)
    await list.getByRole('button', { name: /^Correct/ }).first().click()
    await list.getByLabel(/^Interval/).fill('7')
    await list.getByRole('button', { name: 'Save correction' }).click()
    await expect.poll(() => list.innerText()).toMatch(/7\.0 min/)
    await page.context().close()
  })
})
