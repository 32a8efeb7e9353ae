/**
 * Scoping in real Chromium: a technician granted Skelby only is told so on Home and sees Skelby's aircraft
 * alone in the fleet, the worksheet list and the due list; an administrator grants a user stations and
 * operators from the Admin page, and adds a station.
 */
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO, SCOPED_DEMO } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

describe('what a user may see', () => {
  it('a technician granted Skelby sees Skelby\'s aircraft and work only, and is told so', async () => {
    const page = await signedInPage(browser, SCOPED_DEMO.skelbyTechnician)
    await page.goto('/')
    await expect.poll(() => page.getByTestId('my-scope').innerText()).toMatch(/You see: Skelby · every operator/)
    await page.goto('/fleet')
    const rows = page.locator('tbody tr')
    await expect.poll(async () => (await rows.allInnerTexts()).map(text => text.match(/QX-\w+/)?.[0]).sort())
      .toEqual(['QX-FMC', 'QX-FMK', 'QX-FML'])
    await page.goto('/due')
    await expect.poll(async () => {
      const texts = await page.locator('li[data-unit]').allInnerTexts()
      return texts.length > 0 && texts.every(text => text.includes('Skelby'))
    }).toBe(true)
    await page.close()
  })

  it('an administrator grants stations and operators, and adds a station', async () => {
    const page = await signedInPage(browser, DEMO.admin)
    await page.goto('/admin')
    await page.getByTestId('station-SKB').waitFor()
    await expect.poll(() => page.getByTestId('operator-CIA').innerText()).toMatch(/Corran Isles Airways[\s\S]*1 aircraft · customer/)

    await page.getByLabel('Station name').fill('Orla Point')
    await page.getByLabel('Code', { exact: true }).first().fill('ORP')
    await page.getByLabel('Time zone (e.g. Europe/London)').fill('Mars/Olympus')
    await page.getByRole('button', { name: 'Add station' }).click()
    await expect.poll(() => page.getByText('Use a time zone name like Europe/London or UTC.').count()).toBe(1)
    await page.getByLabel('Time zone (e.g. Europe/London)').fill('Europe/Dublin')
    await page.getByRole('button', { name: 'Add station' }).click()
    await page.getByTestId('station-ORP').waitFor()

    await page.getByRole('button', { name: 'Stations and operators Ada Quillon may see' }).click()
    await page.getByRole('heading', { name: 'What Ada Quillon may see' }).waitFor()
    await page.getByLabel('Skelby', { exact: true }).check()
    await page.getByRole('button', { name: 'Save what Ada Quillon may see' }).click()
    await page.getByRole('heading', { name: 'What Ada Quillon may see' }).waitFor({ state: 'detached' })

    const engineer = await signedInPage(browser, SCOPED_DEMO.harlowEngineer)
    await engineer.goto('/')
    await expect.poll(() => engineer.getByTestId('my-scope').innerText()).toMatch(/Harlow Moor, Skelby · every operator/)
    await engineer.close()
    await page.close()
  })
})
