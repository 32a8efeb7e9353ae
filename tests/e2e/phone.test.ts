/**
 * The phone, built for the step in hand (390 × 844, a common phone screen): a worksheet opens on its
 * current step with the list of steps folded below it; on Charge target the figure stays in view beside
 * the temperature keys; every temperature has a ± key.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { launchBrowser, PHONE, signedInPage } from '../support/browser'
import { unitAt } from '../support/worksheet-flow'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

/** Whether an element lies wholly inside the first screen of the page as it is scrolled now. */
const inView = (box: { y: number, height: number } | null) => !!box && box.y >= 0 && box.y + box.height <= PHONE.height

describe('the phone', () => {
  it('a worksheet opens on the step in hand; the list of steps is folded below it', async () => {
    const cookie = await signIn(DEMO.technician)
    const unit = await unitAt(cookie, 'QX-FMK', /System 1/)
    const created = await api('/api/worksheets', { cookie, body: { accumulatorId: unit.id, workOrder: `WO-PHONE-${Date.now()}`, reason: 'scheduled' } })
    expect(created.status).toBe(201)
    const page = await signedInPage(browser, DEMO.technician, undefined, { viewport: PHONE })
    await page.goto(`/worksheets/${created.body.id}`)
    const heading = page.getByRole('heading', { name: '1 · Preparation' })
    await heading.waitFor()
    const box = await heading.boundingBox()
    console.info(`phone: the step heading at y = ${Math.round(box?.y ?? -1)} px of ${PHONE.height}`)
    expect(inView(box), 'the current step\'s heading on the first screen').toBe(true)
    // The list is folded: its buttons are hidden until asked for, and choosing a step folds it again.
    const toggle = page.getByTestId('steps-toggle')
    expect(await toggle.innerText()).toMatch(/All steps · 0 of 8 done/)
    expect(await page.getByRole('navigation', { name: 'Worksheet steps' }).getByRole('button', { name: /Tools/ }).count()).toBe(0)
    await toggle.click()
    await page.getByRole('navigation', { name: 'Worksheet steps' }).getByRole('button', { name: /Conditions/ }).click()
    await page.getByRole('heading', { name: '3 · Conditions' }).waitFor()
    expect(await toggle.getAttribute('aria-expanded')).toBe('false')
    // The gas temperature has its ± key.
    await page.getByLabel(/Gas temperature/).fill('12')
    await page.getByRole('button', { name: 'Change the sign (below or above zero)' }).first().click()
    await expect.poll(() => page.getByLabel(/Gas temperature/).inputValue()).toMatch(/^[−-]12$/)
    await page.context().close()
  })

  it('Charge target keeps the figure in view beside the temperature keys', async () => {
    const page = await signedInPage(browser, DEMO.technician, undefined, { viewport: PHONE })
    await page.goto('/charge-target')
    await page.getByRole('button', { name: /QX-FMC/ }).click()
    await page.getByRole('button', { name: /Normal brake/ }).click()
    await page.getByLabel(/Gas temperature/).fill('10')
    const docked = page.getByTestId('dock-target-value')
    await expect.poll(() => docked.innerText()).toMatch(/\d{3,}/)
    const at10 = await docked.innerText()
    // The temperature field is where the thumb is; the figure stays on the same screen.
    await page.getByLabel(/Gas temperature/).scrollIntoViewIfNeeded()
    expect(inView(await page.getByLabel(/Gas temperature/).boundingBox())).toBe(true)
    expect(inView(await docked.boundingBox()), 'the figure on the same screen as the temperature').toBe(true)
    // One degree warmer from the dock: the figure changes where the mechanic is looking.
    await page.getByTestId('target-dock').getByRole('button', { name: 'One degree warmer' }).click()
    await expect.poll(() => page.getByLabel(/Gas temperature/).inputValue()).toBe('11')
    await expect.poll(() => docked.innerText()).not.toBe(at10)
    await page.context().close()
  })
})
