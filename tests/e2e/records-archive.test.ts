/**
 * The records archive in real Chromium: an administrator picks a period and a station on the Admin page, the
 * browser downloads one ZIP, and its manifest lists the records of that station with their SHA-256 sums.
 */
import { readFileSync } from 'node:fs'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import yauzl from 'yauzl'
import { DEMO } from '../support/api'
import { launchBrowser, signedInPage } from '../support/browser'

let browser: Browser
beforeAll(async () => {
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
})

/** The text of one entry of a ZIP file. */
function entryText(file: string, name: string): Promise<string> {
  return new Promise((done, fail) => {
    yauzl.fromBuffer(readFileSync(file), { lazyEntries: true }, (error, zip) => {
      if (error) return fail(error)
      zip.on('entry', (entry: yauzl.Entry) => {
        if (entry.fileName !== name) return zip.readEntry()
        zip.openReadStream(entry, (streamError, stream) => {
          if (streamError) return fail(streamError)
          const chunks: Buffer[] = []
          stream.on('data', (chunk: Buffer) => chunks.push(chunk))
          stream.on('end', () => done(Buffer.concat(chunks).toString('utf8')))
        })
      })
      zip.on('end', () => fail(new Error(`${name} is not in the archive`)))
      zip.readEntry()
    })
  })
}

describe('Admin → Records archive', () => {
  it('downloads a station\'s released records of a period as one ZIP with its manifest', async () => {
    const page = await signedInPage(browser, DEMO.admin)
    await page.goto('/admin')
    const section = page.locator('section', { has: page.getByRole('heading', { name: 'Records archive' }) })
    await section.getByLabel('From', { exact: true }).fill('2000-01-01')
    await section.getByLabel('To', { exact: true }).fill('2100-12-31')
    await section.getByLabel('Station').selectOption({ label: 'Skelby' })
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      section.getByRole('button', { name: 'Download the archive' }).click(),
    ])
    expect(download.suggestedFilename()).toMatch(/^chargewell-records-2000-01-01-to-2100-12-31-Skelby\.zip$/)
    const file = await download.path()
    const manifest = JSON.parse(await entryText(file, 'manifest.json'))
    expect(manifest).toMatchObject({ format: 'chargewell-records-archive/1', station: 'Skelby' })
    expect(manifest.records).toBeGreaterThan(0)
    expect(manifest.files.filter((listed: { path: string }) => listed.path.endsWith('.pdf'))).toHaveLength(manifest.records)
    await page.close()
  })
})
