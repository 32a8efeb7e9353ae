/**
 * The Due page in real Chromium: the technician's station by default, the buckets, and one press to start
 * the worksheet.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('the Due page', () => {
  it('lists the home station\'s due units with their reasons, and starts a worksheet from one', async () => {
    const technician = await signedInPage(browser, DEMO.technician)
    await technician.goto('/due')
    await expect.poll(() => technician.getByLabel('Station').inputValue()).toBe('Harlow Moor')
    const sections = ['due-overdue', 'due-this-week', 'due-this-month', 'due-later']
    for (const id of sections) await technician.getByTestId(id).waitFor()
    const first = technician.locator('li[data-unit]').first()
    await expect.poll(() => first.innerText()).toMatch(/P\/N FA-\d{4}-\d{2}[\s\S]*(Every \d+ days|Brought forward|No released check)/)
    const unit = await first.getAttribute('data-unit')
    await first.getByRole('link', { name: 'Start worksheet' }).click()
    await technician.waitForURL(url => url.pathname === '/worksheets/new' && url.searchParams.get('unit') === unit)
    await technician.getByLabel('Work order').fill('WO-DUE-0001')
    await technician.getByRole('button', { name: 'Start worksheet' }).click()
    await technician.waitForURL(url => /\/worksheets\/\d+$/.test(url.pathname))

    // Another station, chosen from the list, is kept in the address.
    await technician.goto('/due')
    await technician.getByLabel('Station').selectOption('Skelby')
    await technician.waitForURL(url => url.searchParams.get('station') === 'Skelby')
    await expect.poll(async () => (await technician.locator('li[data-unit]').allInnerTexts()).every(text => text.includes('Skelby'))).toBe(true)
  })
})
