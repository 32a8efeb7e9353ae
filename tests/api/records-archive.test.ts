/**
 * Released records in bulk: the archive of a period streams as one ZIP whose manifest's SHA-256 sums match every
 * file in it (read back with yauzl, an outside ZIP reader); each record is there as a PDF and a line of NDJSON;
 * a station or operator filter keeps to it; its audit trail is the period's signed run of the chain, which the
 * offline checker passes; bad input is named; only administrators may take it. Then, on a fleet-like database
 * built by the scale benchmark's builder (10,100 worksheets: at least 10,000 released records), the server's
 * resident memory (its own process_resident_memory_bytes, read from /metrics while the archive streams) grows by
 * less than 100 MB.
 */
import { createHash } from 'node:crypto'
import { spawnSync } from 'node:child_process'
import { createWriteStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import yauzl from 'yauzl'
import { buildScaleDatabase } from '../bench/scale-database'
import { DEMO, signInAt } from '../support/api'
import { isPostgresUrl } from '../support/postgres'
import { startTestServer, type TestServer } from '../support/test-server'

const root = resolve(import.meta.dirname, '../..')
const TOKEN = 'metrics-token-for-the-archive-test'
// Enough worksheets for at least 10,000 released records (the builder leaves about 0.6 % open).
const FLEET_WORKSHEETS = Number(process.env.CHARGEWELL_ARCHIVE_WORKSHEETS ?? 10_100)
const FLEET_RECORDS = Math.min(10_000, Math.floor(FLEET_WORKSHEETS * 0.98))
const folder = mkdtempSync(join(tmpdir(), 'chargewell-archive-'))
let server: TestServer
beforeAll(async () => {
  server = await startTestServer({ NUXT_METRICS_TOKEN: TOKEN })
}, 60_000)
afterAll(async () => {
  await server?.dispose()
  rmSync(folder, { recursive: true, force: true })
})

/** Downloads the archive to a file; answers the file. */
async function download(baseURL: string, query: string, cookie: string, name: string, during?: () => void) {
  const response = await fetch(`${baseURL}/api/records/archive?${query}`, { headers: { cookie } })
  if (!response.ok) throw new Error(`${response.status}: ${await response.text()}`)
  expect(response.headers.get('content-type')).toBe('application/zip')
  const file = join(folder, name)
  const timer = during ? setInterval(during, 200) : undefined
  try {
    await pipeline(Readable.fromWeb(response.body! as never), createWriteStream(file))
  }
  finally {
    clearInterval(timer)
  }
  return file
}

/** Every entry of the ZIP: its name, size and SHA-256, and the text of the small ones. */
function readZip(file: string): Promise<Map<string, { bytes: number, sha256: string, text?: string }>> {
  return new Promise((done, fail) => {
    const entries = new Map<string, { bytes: number, sha256: string, text?: string }>()
    yauzl.open(file, { lazyEntries: true }, (error, zip) => {
      if (error) return fail(error)
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (streamError, stream) => {
          if (streamError) return fail(streamError)
          const hash = createHash('sha256')
          const keep = !entry.fileName.endsWith('.pdf')
          const chunks: Buffer[] = []
          let bytes = 0
          stream.on('data', (chunk: Buffer) => {
            hash.update(chunk)
            bytes += chunk.length
            if (keep) chunks.push(chunk)
          })
          stream.on('end', () => {
            entries.set(entry.fileName, { bytes, sha256: hash.digest('hex'), text: keep ? Buffer.concat(chunks).toString('utf8') : undefined })
            zip.readEntry()
          })
          stream.on('error', fail)
        })
      })
      zip.on('end', () => done(entries))
      zip.on('error', fail)
      zip.readEntry()
    })
  })
}

async function checkArchive(file: string) {
  const entries = await readZip(file)
  const manifest = JSON.parse(entries.get('manifest.json')!.text!)
  for (const listed of manifest.files as { path: string, bytes: number, sha256: string }[]) {
    expect(entries.get(listed.path), listed.path).toMatchObject({ bytes: listed.bytes, sha256: listed.sha256 })
  }
  // Nothing in the archive the manifest does not list (but the manifest itself).
  expect([...entries.keys()].filter(name => name !== 'manifest.json').sort()).toEqual(manifest.files.map((listed: { path: string }) => listed.path).sort())
  return { entries, manifest }
}

describe('the records archive', () => {
  it('holds each released record as a PDF and a line, with a manifest whose sums match', { timeout: 120_000 }, async () => {
    const admin = await signInAt(server.baseURL, DEMO.admin)
    const file = await download(server.baseURL, 'from=2000-01-01&to=2100-12-31', admin, 'all.zip')
    const { entries, manifest } = await checkArchive(file)
    const lines = entries.get('records.ndjson')!.text!.trim().split('\n').map(line => JSON.parse(line))
    expect(lines.length).toBe(manifest.records)
    expect(lines.length).toBeGreaterThan(10)
    for (const record of lines) {
      expect(record.state).toBe('released')
      expect(record.signatures.length).toBeGreaterThanOrEqual(2)
      expect(entries.has(`records/worksheet-${record.id}.pdf`)).toBe(true)
    }
    expect(entries.get('audit-trail.ndjson')!.bytes).toBeGreaterThan(1000)

    // A narrower period: its records were released in it, and its audit trail is the period's signed run of the
    // chain, which the offline checker passes with the pinned key.
    const summerFile = await download(server.baseURL, 'from=2026-06-01&to=2026-08-31', admin, 'summer.zip')
    const summer = await checkArchive(summerFile)
    const summerLines = summer.entries.get('records.ndjson')!.text!.trim().split('\n').filter(Boolean).map(line => JSON.parse(line))
    expect(summerLines.length).toBeGreaterThan(0)
    expect(summerLines.length).toBeLessThan(lines.length)
    for (const record of summerLines) expect(record.releasedAt >= '2026-06-01' && record.releasedAt < '2026-09-01', record.releasedAt).toBe(true)
    const trail = summer.entries.get('audit-trail.ndjson')!.text!
    const header = JSON.parse(trail.split('\n')[0]!)
    expect(header).toMatchObject({ version: 3, period: { from: '2026-06-01', to: '2026-08-31' } })
    expect(summer.manifest.auditTrail).toMatchObject({ entries: trail.trimEnd().split('\n').length - 2, anchor: header.anchor })
    const trailFile = join(folder, 'summer-audit.ndjson')
    writeFileSync(trailFile, trail)
    const { fingerprint } = (await (await fetch(`${server.baseURL}/api/audit/verify`, { headers: { cookie: admin } })).json()).signingKey
    const checked = spawnSync(process.execPath, [join(root, 'scripts/check-audit-export.mjs'), trailFile, '--key', fingerprint], { encoding: 'utf8' })
    expect(checked.status, checked.stderr).toBe(0)
    expect(checked.stdout).toContain('of the period 2026-06-01 to 2026-08-31')

    // One station: only its aircraft's records.
    const skelbyFile = await download(server.baseURL, 'from=2000-01-01&to=2100-12-31&station=Skelby', admin, 'skelby.zip')
    const skelby = await checkArchive(skelbyFile)
    const skelbyLines = skelby.entries.get('records.ndjson')!.text!.trim().split('\n').filter(Boolean).map(line => JSON.parse(line))
    expect(skelbyLines.length).toBeLessThan(lines.length)
    const aircraft = (await (await fetch(`${server.baseURL}/api/aircraft?pageSize=100`, { headers: { cookie: admin } })).json()).items as { registration: string, base: string }[]
    const atSkelby = new Set(aircraft.filter(entry => entry.base === 'Skelby').map(entry => entry.registration))
    for (const record of skelbyLines) {
      expect(atSkelby.has(record.content.aircraft.registration), record.content.aircraft.registration).toBe(true)
    }
  })

  it('names bad input, and refuses everyone but administrators', async () => {
    const admin = await signInAt(server.baseURL, DEMO.admin)
    const bad = await fetch(`${server.baseURL}/api/records/archive?from=2026-02-30&to=2026-01-01`, { headers: { cookie: admin } })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(await bad.json())).toContain('from')
    const backwards = await fetch(`${server.baseURL}/api/records/archive?from=2026-03-01&to=2026-01-01`, { headers: { cookie: admin } })
    expect(backwards.status).toBe(400)
    expect(JSON.stringify(await backwards.json())).toContain('cannot come before')
    for (const role of ['technician', 'inspector', 'engineer'] as const) {
      const cookie = await signInAt(server.baseURL, DEMO[role])
      expect((await fetch(`${server.baseURL}/api/records/archive?from=2026-01-01&to=2026-12-31`, { headers: { cookie } })).status).toBe(403)
    }
  })

  it('stops making the archive when the download is closed before its end', async () => {
    const admin = await signInAt(server.baseURL, DEMO.admin)
    const control = new AbortController()
    const response = await fetch(`${server.baseURL}/api/records/archive?from=2000-01-01&to=2100-12-31`, { headers: { cookie: admin }, signal: control.signal })
    let bytes = 0
    await expect((async () => {
      for await (const chunk of Readable.fromWeb(response.body! as never)) {
        bytes += chunk.length
        if (bytes > 100_000) control.abort()
      }
    })()).rejects.toThrow()
    await expect.poll(() => server.log.join('')).toContain('records archive cancelled by the client')
  })

  it('streams a fleet\'s released records with the server\'s memory growing by less than 100 MB', { timeout: 2_400_000 }, async () => {
    // SQLite only: the fleet-sized database is built by the scale benchmark's builder (PostgreSQL runs the rest).
    if (isPostgresUrl(server.database)) return
    const database = join(folder, 'fleet.sqlite')
    // The builder seeds through scripts/task.mjs: with this run's build, never a build of its own.
    process.env.CHARGEWELL_OUTPUT = inject('outputDir')
    await buildScaleDatabase(database, FLEET_WORKSHEETS, inject('sessionPassword'), () => undefined)
    const fleet = await startTestServer({ NUXT_DB_PATH: database, NUXT_METRICS_TOKEN: TOKEN })
    try {
      const rss = async () => {
        const text = await (await fetch(`${fleet.baseURL}/metrics`, { headers: { authorization: `Bearer ${TOKEN}` } })).text()
        return Number(/^process_resident_memory_bytes\{[^}]*\} (\d+)/m.exec(text)![1])
      }
      const admin = await signInAt(fleet.baseURL, DEMO.admin)
      // Warmed up first (fonts parsed, code compiled, the heap grown to its working size) with a short period:
      // what is measured is growth with the number of records, not the first PDF's one-off cost.
      await download(fleet.baseURL, 'from=2000-01-01&to=2018-03-31', admin, 'warm-up.zip')
      const before = await rss()
      let peak = before
      const sample = () => void rss().then(value => (peak = Math.max(peak, value))).catch(() => undefined)
      const file = await download(fleet.baseURL, 'from=2000-01-01&to=2100-12-31', admin, 'fleet.zip', sample)
      peak = Math.max(peak, await rss())
      const { manifest } = await checkArchive(file)
      expect(manifest.records).toBeGreaterThanOrEqual(FLEET_RECORDS)
      console.log(`Records archive: ${manifest.records} records; server RSS ${Math.round(before / 1e6)} MB → peak ${Math.round(peak / 1e6)} MB (+${Math.round((peak - before) / 1e6)} MB)`)
      expect(peak - before).toBeLessThan(100 * 1024 * 1024)
    }
    finally {
      await fleet.dispose()
    }
  })
})
