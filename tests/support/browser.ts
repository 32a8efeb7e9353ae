import { chromium, type Browser, type Page } from 'playwright-core'
import { onTestFailed } from 'vitest'
import { baseURL } from './file-server'

/** Debian's Chromium, headless, with the flags this closed network needs. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
}

/**
 * Makes `page.goto` and `page.reload` return only once the app has hydrated (`<html data-hydrated>`,
 * plugins/hydrated.client.ts). A click on server-rendered HTML before then is lost: on a busy
 * machine a test that clicked an aircraft at once waited 30 s for positions that never came.
 */
export function waitForHydration(page: Page): Page {
  const live = () => page.locator('html[data-hydrated]').waitFor({ state: 'attached' })
  const goto = page.goto.bind(page)
  const reload = page.reload.bind(page)
  page.goto = async (...args) => {
    const response = await goto(...args)
    await live()
    return response
  }
  page.reload = async (...args) => {
    const response = await reload(...args)
    await live()
    return response
  }
  return page
}

/** A new tablet-sized page (or `viewport`) signed in as `email`. */
export const PHONE = { width: 390, height: 844 }

export async function signedInPage(
  browser: Browser, email: string, password = 'chargewell-demo',
  options: { locale?: string, viewport?: { width: number, height: number }, host?: string } = {},
): Promise<Page> {
  // `host: 'localhost'`: WebAuthn takes a domain as the relying party, never an IP address.
  const address = options.host ? baseURL().replace('127.0.0.1', options.host) : baseURL()
  const context = await browser.newContext({
    baseURL: address, viewport: options.viewport ?? { width: 1180, height: 820 }, locale: options.locale,
  })
  const page = waitForHydration(await context.newPage())
  // When a test fails, say what the browser saw go wrong (answers of 400 and up, console errors).
  const trouble: string[] = []
  page.on('response', response => response.status() >= 400 && trouble.push(`${response.status()} ${response.request().method()} ${response.url()}`))
  page.on('console', message => message.type() === 'error' && trouble.push(`console: ${message.text()}`))
  onTestFailed(async () => {
    const body = await page.locator('body').innerText({ timeout: 2000 }).catch(() => '(page gone)')
    console.error(`Browser trouble for ${email}:\n${trouble.join('\n') || '(none)'}\nPage ${page.url()}:\n${body.slice(0, 1500)}`)
  })
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL(url => url.pathname === '/')
  // Attached, not visible: at phone size the navigation sits behind the Menu button.
  await page.locator('#main-navigation a').first().waitFor({ state: 'attached' })
  return page
}
