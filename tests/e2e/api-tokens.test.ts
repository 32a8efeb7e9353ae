/**
 * API tokens in real Chromium: issued on Your account (shown once), used by another system, revoked in the page.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { baseURL } from '../support/file-server'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const calculation = (token: string) =>
  fetch(`${baseURL()}/api/calc/charge-target`, {
    method: 'POST',
    headers: { 'authorization': `Bearer ${token}`, 'content-type': 'application/json' },
    body: JSON.stringify({
      reference: { pressure: { value: 1000, unit: 'psi', basis: 'gauge' }, temperature: { value: 21, unit: 'C' } },
      gasTemperature: { value: 5, unit: 'C' },
      tolerance: { minus: 50, plus: 50, unit: 'psi' },
    }),
  })

describe('API tokens on Your account', () => {
  it('a technician issues a token, another system uses it, the technician revokes it', async () => {
    const page = await signedInPage(browser, DEMO.technician)
    await page.goto('/account')
    await page.getByRole('button', { name: 'Issue token' }).click()
    await expect.poll(() => page.getByText('Give the token at least one scope.').count()).toBe(1)
    await page.getByLabel('What will use it').fill('Planning system')
    await page.getByLabel('Run calculations').check()
    await page.getByRole('button', { name: 'Issue token' }).click()
    const shown = page.getByTestId('issued-token').locator('code')
    await expect.poll(() => shown.innerText()).toMatch(/^cw_/)
    const token = (await shown.innerText()).trim()
    expect((await calculation(token)).status).toBe(200)

    await page.getByRole('button', { name: 'I have copied it' }).click()
    await page.getByRole('button', { name: 'Revoke' }).first().click()
    await page.getByRole('button', { name: 'Revoke token' }).click()
    await expect.poll(() => page.getByText('“Planning system” revoked.').count()).toBe(1)
    expect((await calculation(token)).status).toBe(401)
    await page.close()
  })

  it('an administrator issues a token for a system\'s account, sees it among every token, and revokes it', async () => {
    const page = await signedInPage(browser, DEMO.admin)
    await page.goto('/admin')
    const section = page.locator('section', { has: page.getByRole('heading', { name: 'API tokens' }) })
    await section.getByLabel('Acts as (the system\'s account)').selectOption({ label: 'Sol Varga (engineer@chargewell.test)' })
    await section.getByLabel('What will use it').fill('Maintenance tracking')
    await section.getByLabel('Run calculations').check()
    await section.getByRole('button', { name: 'Issue token' }).click()
    const shown = section.getByTestId('issued-token').locator('code')
    await expect.poll(() => shown.innerText()).toMatch(/^cw_/)
    const token = (await shown.innerText()).trim()
    expect((await calculation(token)).status).toBe(200)
    await expect.poll(() => section.locator('li').filter({ hasText: 'Maintenance tracking' }).innerText()).toMatch(/acts as Sol Varga/)
    await section.locator('li').filter({ hasText: 'Maintenance tracking' }).getByRole('button', { name: 'Revoke' }).click()
    await page.getByRole('button', { name: 'Revoke token' }).click()
    await expect.poll(async () => (await calculation(token)).status).toBe(401)
    await page.close()
  })
})
