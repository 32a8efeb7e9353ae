import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { NAVIGATION, navigationFor } from '../../shared/navigation'
import type { Role } from '../../shared/types/user'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

const accounts: [string, Role[]][] = [
  ['technician@chargewell.test', ['technician']],
  ['inspector@chargewell.test', ['inspector']],
  ['engineer@chargewell.test', ['engineer']],
  ['admin@chargewell.test', ['admin']],
  ['lead@chargewell.test', ['technician', 'inspector']],
]

describe('sign-in and navigation per role', () => {
  it.each(accounts)('%s sees exactly the pages of %j', async (email, roles) => {
    const page = await signedInPage(browser, email)
    const navigation = page.getByRole('navigation', { name: 'Main' })
    const expected = navigationFor(roles).map(item => item.label)
    await expect.poll(async () => (await navigation.getByRole('link').allInnerTexts()).map(text => text.trim())).toEqual(expected)
    const shown = (await navigation.getByRole('link').allInnerTexts()).map(text => text.trim())
    for (const hidden of NAVIGATION.filter(item => !navigationFor(roles).includes(item))) {
      expect(shown).not.toContain(hidden.label)
    }
    await page.context().close()
  })

  it('a wrong password shows the reason and keeps what was typed', async () => {
    const context = await browser.newContext({ baseURL: baseURL() })
    const page = await context.newPage()
    await page.goto('/login')
    await page.getByLabel('E-mail').fill('technician@chargewell.test')
    await page.getByLabel('Password').fill('wrong-password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').innerText()).toMatch(/do not match/)
    expect(await page.getByLabel('E-mail').inputValue()).toBe('technician@chargewell.test')
    await context.close()
  })

  it('sends a signed-out visitor to sign-in, and a technician away from Admin', async () => {
    const context = await browser.newContext({ baseURL: baseURL() })
    const anonymous = await context.newPage()
    await anonymous.goto('/charge-target')
    await anonymous.waitForURL(url => url.pathname === '/login')
    await context.close()

    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/admin')
    await expect.poll(() => page.locator('body').innerText()).toMatch(/needs the admin role|403/)
    await page.context().close()
  })

  it('keeps unit preferences from the user menu on the server', async () => {
    const page = await signedInPage(browser, 'engineer@chargewell.test')
    await page.getByTestId('user-menu').first().click()
    const dialog = page.getByRole('dialog', { name: 'Your settings' })
    await dialog.getByRole('button', { name: 'bar', exact: true }).click()
    await dialog.getByRole('button', { name: 'Save settings' }).click()
    await expect.poll(() => dialog.isVisible()).toBe(false)
    await page.reload()
    const me = await page.evaluate(() => fetch('/api/me').then(response => response.json()))
    expect(me.preferences.pressureUnit).toBe('bar')
    await page.context().close()
  })
})
