import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { NAVIGATION, navigationFor } from '../../shared/navigation'
import type { Role } from '../../shared/types/user'
import { launchBrowser, signedInPage, waitForHydration } from '../support/browser'

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
    const page = waitForHydration(await context.newPage())
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
    const anonymous = waitForHydration(await context.newPage())
    await anonymous.goto('/charge-target')
    await anonymous.waitForURL(url => url.pathname === '/login')
    await context.close()

    const page = await signedInPage(browser, 'technician@chargewell.test')
    await page.goto('/admin')
    const error = page.getByTestId('error-page')
    await expect.poll(() => error.innerText()).toMatch(/Error 403[\s\S]*Not open to your role[\s\S]*needs the admin role/)
    // The app's own frame and a way back.
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(true)
    await error.getByRole('button', { name: 'Home' }).click()
    await page.waitForURL(url => url.pathname === '/')
    await page.goto('/no/such/page')
    await expect.poll(() => page.getByTestId('error-page').innerText()).toMatch(/Error 404[\s\S]*Nothing here/)
    await page.context().close()
  })

  it.each(accounts)('every page %s can see runs under the content security policy without a violation', async (email, roles) => {
    const page = await signedInPage(browser, email)
    const violations: string[] = []
    page.on('console', message => /Content Security Policy|Refused to (execute|load|apply)/i.test(message.text()) && violations.push(`${page.url()}: ${message.text()}`))
    await page.exposeFunction('reportViolation', (text: string) => violations.push(text))
    await page.addInitScript(() => document.addEventListener('securitypolicyviolation', event => (window as unknown as { reportViolation: (text: string) => void }).reportViolation(`${event.violatedDirective} ${event.blockedURI}`)))
    for (const item of navigationFor(roles)) {
      await page.goto(item.to)
      await page.getByRole('heading', { level: 1 }).first().waitFor()
      await page.waitForLoadState('networkidle')
    }
    expect(violations).toEqual([])
    // The watch itself works: an inline handler, which the policy forbids, is reported.
    await page.evaluate(() => {
      const probe = document.createElement('button')
      probe.setAttribute('onclick', 'document.title = "ran"')
      document.body.append(probe)
      probe.click()
    })
    await expect.poll(() => violations.length).toBeGreaterThan(0)
    expect(await page.title()).not.toBe('ran')
    await page.context().close()
  })

  it('an account page lists the devices; signing out everywhere else ends the other device\'s session', async () => {
    const tablet = await signedInPage(browser, 'inspector@chargewell.test')
    const phone = await signedInPage(browser, 'inspector@chargewell.test')
    await tablet.getByTestId('user-menu').first().click()
    await tablet.getByTestId('account-link').first().click()
    await tablet.waitForURL(url => url.pathname === '/account')
    await expect.poll(() => tablet.getByTestId('session-count').innerText()).toMatch(/Signed in on [2-9] devices/)
    await tablet.getByTestId('end-other-sessions').click()
    await expect.poll(() => tablet.getByTestId('session-count').innerText()).toBe('Signed in on 1 device.')
    await phone.goto('/countersign')
    await phone.waitForURL(url => url.pathname === '/login')
    await tablet.context().close()
    await phone.context().close()
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

describe('a link followed from another site (the session cookie is SameSite=Strict)', () => {
  it('lands a signed-in inspector on the page the e-mail pointed at, not on sign-in', async () => {
    const page = await signedInPage(browser, 'inspector@chargewell.test')
    // A page of no site of ours (as a webmail would be) with the link from the countersign e-mail.
    await page.setContent(`<a id="mail-link" href="${baseURL()}/countersign">Open the countersign queue</a>`)
    await page.locator('#mail-link').click()
    await page.waitForURL(url => url.pathname === '/countersign', { timeout: 30_000 })
    await expect.poll(() => page.getByRole('heading', { level: 1 }).innerText()).toMatch(/Countersign/)
    await page.context().close()
  })
})
