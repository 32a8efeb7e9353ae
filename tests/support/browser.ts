import { chromium, type Browser, type Page } from 'playwright-core'
import { inject } from 'vitest'

/** Debian's Chromium, headless, with the flags this closed network needs. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
}

/** A new tablet-sized page signed in as `email`. */
export async function signedInPage(browser: Browser, email: string, password = 'chargewell-demo'): Promise<Page> {
  const context = await browser.newContext({ baseURL: inject('baseURL'), viewport: { width: 1180, height: 820 } })
  const page = await context.newPage()
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => url.pathname === '/')
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link').first().waitFor()
  return page
}
