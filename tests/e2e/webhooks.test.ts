/**
 * Webhooks in real Chromium: an administrator registers an endpoint (a bad address said on its field), is
 * shown the signing secret once, sends a test message to a local receiver and sees it taken in the
 * endpoint's deliveries; the message verifies under that secret with the Standard Webhooks library.
 */
import { createServer, type IncomingHttpHeaders } from 'node:http'
import type { Browser } from 'playwright-core'
import { Webhook } from 'standardwebhooks'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'
import { freePort } from '../support/ports'

let browser: Browser
const received: { body: string, headers: IncomingHttpHeaders }[] = []
const receiver = createServer((request, response) => {
  let body = ''
  request.on('data', chunk => (body += chunk))
  request.on('end', () => {
    received.push({ body, headers: request.headers })
    response.writeHead(204).end()
  })
})
let receiverUrl = ''
beforeAll(async () => {
  browser = await launchBrowser()
  const port = await freePort()
  await new Promise<void>(listening => receiver.listen(port, '127.0.0.1', listening))
  receiverUrl = `http://127.0.0.1:${port}/chargewell`
})
afterAll(async () => {
  await browser?.close()
  receiver.close()
})

describe('Admin → Webhooks', () => {
  it('registers an endpoint, shows its secret once, and a test message is taken and verifies', async () => {
    const page = await signedInPage(browser, DEMO.admin)
    await page.goto('/admin')
    await page.getByRole('link', { name: 'Webhooks' }).click()
    await expect.poll(() => page.getByText('No endpoint is registered').count()).toBe(1)
    await page.getByLabel('Address that receives the events').fill('http://tracking.example/hooks')
    await page.getByLabel('What receives them').fill('Maintenance tracking')
    await page.getByRole('button', { name: 'Add endpoint' }).click()
    await expect.poll(() => page.getByText('Use an https:// address').count()).toBe(1)

    await page.getByLabel('Address that receives the events').fill(receiverUrl)
    await page.getByRole('button', { name: 'Add endpoint' }).click()
    const shown = page.getByTestId('webhook-secret').locator('code')
    await expect.poll(() => shown.count()).toBe(1)
    const secret = (await shown.innerText()).trim()
    expect(secret).toMatch(/^whsec_/)
    await page.getByRole('button', { name: 'I have copied it' }).click()
    await expect.poll(() => page.getByTestId('webhook-secret').count()).toBe(0)

    await page.getByRole('button', { name: 'Send a test message' }).click()
    await expect.poll(() => received.length).toBe(1)
    const [message] = received
    expect(new Webhook(secret).verify(message!.body, message!.headers as Record<string, string>)).toMatchObject({ type: 'webhook.test' })
    await page.getByRole('button', { name: 'Deliveries' }).click()
    const fate = page.getByTestId('delivery-fate').first()
    await expect.poll(() => fate.innerText()).toMatch(/^delivered/)
    // The secret is nowhere on the page any more.
    expect(await page.content()).not.toContain(secret)
    await page.close()
  })
})

describe('the API reference', () => {
  it('lists every route from the served description, finds one, and says who may call it', async () => {
    const page = await signedInPage(browser, DEMO.technician)
    await page.goto('/account')
    await page.getByRole('link', { name: 'API reference' }).click()
    const count = page.getByTestId('route-count')
    await expect.poll(() => count.innerText()).toMatch(/^1[2-9]\d routes/)
    await page.getByLabel('Find a route').fill('countersign')
    await expect.poll(() => count.innerText()).toMatch(/^\d routes?/)
    const operation = page.getByTestId('operation-post-/api/worksheets/{id}/countersign')
    await operation.getByRole('button').first().click()
    await expect.poll(() => operation.innerText()).toContain('Needs the inspector role')
    await expect.poll(() => operation.innerText()).toContain('"certify": true')
    await page.close()
  })
})
