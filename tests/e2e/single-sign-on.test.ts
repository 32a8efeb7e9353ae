/**
 * Single sign-on in real Chromium: the sign-in page offers the organisation's provider; the button goes there
 * and back (a real OpenID Connect provider, tests/support/identity-provider.ts) and the person lands signed in
 * where they were going, with the roles their groups give; a person Chargewell does not know is told so on the
 * sign-in page.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, waitForHydration } from '../support/browser'
import { startIdentityProvider, ssoEnvironment } from '../support/identity-provider'
import { freePort } from '../support/ports'
import { startTestServer, type TestServer } from '../support/test-server'

let browser: Browser
let server: TestServer
let idp: Awaited<ReturnType<typeof startIdentityProvider>>
beforeAll(async () => {
  browser = await launchBrowser()
  const idpPort = await freePort()
  server = await startTestServer(ssoEnvironment(`http://127.0.0.1:${idpPort}`))
  idp = await startIdentityProvider(idpPort, `${server.baseURL}/api/auth/sso/callback`, {
    'idp-ada': { email: 'harlow.engineer@chargewell.test', email_verified: true, name: 'Ada Quillon', groups: ['mro-engineering'] },
    'idp-nobody': { email: 'nobody@fellmoor.example', email_verified: true, name: 'Nobody', groups: ['mro-engineering'] },
  })
}, 90_000)
afterAll(async () => {
  await browser?.close()
  await server?.dispose()
  await idp?.close()
})

describe('signing in through the organisation\'s identity provider', () => {
  it('goes to the provider and back, signed in where the person was going', async () => {
    const context = await browser.newContext({ baseURL: server.baseURL, viewport: { width: 1180, height: 820 } })
    const page = waitForHydration(await context.newPage())
    idp.signInAs('idp-ada')
    await page.goto('/trends')
    await page.waitForURL(url => url.pathname === '/login')
    await page.getByRole('link', { name: 'Sign in with Fellmoor sign-in' }).click()
    await page.waitForURL(url => url.pathname === '/trends')
    await page.goto('/')
    await expect.poll(() => page.getByTestId('my-scope').innerText()).toContain('Harlow Moor')
    await context.close()
  })

  it('tells a person Chargewell does not know why they were refused', async () => {
    const context = await browser.newContext({ baseURL: server.baseURL, viewport: { width: 1180, height: 820 } })
    const page = waitForHydration(await context.newPage())
    idp.signInAs('idp-nobody')
    await page.goto('/login')
    await page.getByRole('link', { name: 'Sign in with Fellmoor sign-in' }).click()
    await page.waitForURL(url => url.pathname === '/login' && url.searchParams.has('refused'))
    await expect.poll(() => page.getByTestId('sso-refused').innerText()).toContain('nobody@fellmoor.example has no Chargewell account')
    // The password form is still there (passwords sign in at this organisation).
    expect(await page.getByLabel('Password').count()).toBe(1)
    await context.close()
  })
})
