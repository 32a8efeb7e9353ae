/**
 * A full disk is answered in words: writes get 503 with a plain message and write nothing half,
 * reads still work (a session's "last seen" is written only when it can be), /api/health reports the
 * database as not writable, and everything recovers once space is freed. The database lives on a
 * small tmpfs this test mounts (root only, as on CI); on PostgreSQL the route tests skip it.
 */
import { execFileSync } from 'node:child_process'
import { closeSync, copyFileSync, mkdirSync, mkdtempSync, openSync, rmSync, writeSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DEMO, signInAt } from '../support/api'
import { isPostgresUrl } from '../support/postgres'
import { startTestServer, type TestServer } from '../support/test-server'

const onPostgres = isPostgresUrl(inject('templateDatabase'))
const root = process.getuid?.() === 0
let mountPoint: string
let server: TestServer
const filler = () => join(mountPoint, 'filler.bin')

beforeAll(async () => {
  if (onPostgres || !root) return
  mountPoint = mkdtempSync(join(tmpdir(), 'chargewell-full-'))
  execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=24m', 'tmpfs', mountPoint])
  mkdirSync(join(mountPoint, 'data'))
  const database = join(mountPoint, 'data', 'chargewell.sqlite')
  copyFileSync(inject('templateDatabase'), database)
  server = await startTestServer({ NUXT_DB_PATH: database })
}, 60_000)
afterAll(async () => {
  await server?.dispose()
  if (mountPoint) {
    execFileSync('umount', ['-l', mountPoint])
    rmSync(mountPoint, { recursive: true, force: true })
  }
})

/** Fills the tmpfs to the last byte. */
function fillTheDisk() {
  const handle = openSync(filler(), 'w')
  const block = Buffer.alloc(64 * 1024, 7)
  try {
    for (;;) writeSync(handle, block)
  }
  catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOSPC') throw error
    // The last partial block, byte by byte down to nothing.
    for (let size = 32 * 1024; size >= 1; size = Math.floor(size / 2)) {
      try {
        for (;;) writeSync(handle, block, 0, size)
      }
      catch { /* this size no longer fits */ }
    }
  }
  finally {
    closeSync(handle)
  }
}

const signIn = (email: string) => signInAt(server.baseURL, email)
const call = async (path: string, cookie: string, init: { method?: string, body?: unknown } = {}) => {
  const response = await fetch(`${server.baseURL}${path}`, {
    method: init.method ?? 'GET',
    headers: { 'content-type': 'application/json', cookie },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
  })
  return { status: response.status, body: await response.json().catch(() => null) }
}

describe.skipIf(onPostgres || !root)('a full disk', () => {
  it('writes answer 503 in words, reads still work, health says not writable, and all recovers when space is freed', { timeout: 120_000 }, async () => {
    const technician = await signIn(DEMO.technician)
    const admin = await signIn(DEMO.admin)
    const units = (await call('/api/accumulators?installed=true&pageSize=50', technician)).body.items as { id: number }[]
    fillTheDisk()
    // SQLite may still have room in its write-ahead log: write until the disk says no (bounded).
    const statuses: number[] = []
    let refusal: { status: number, body: { message: string } } | undefined
    for (let index = 0; index < 400 && !refusal; index++) {
      const answer = await call('/api/worksheets', technician, { method: 'POST', body: { accumulatorId: units[index % units.length]!.id, workOrder: `WO-FULL-${index}`, reason: 'scheduled' } })
      statuses.push(answer.status)
      if (answer.status !== 201) refusal = answer
    }
    expect(statuses.filter(status => status >= 500 && status !== 503)).toEqual([])
    expect(refusal?.status).toBe(503)
    expect(refusal!.body.message).toMatch(/disk is full[\s\S]*Nothing was saved/)

    const health = await fetch(`${server.baseURL}/api/health`)
    expect(health.status).toBe(503)
    expect(await health.json()).toMatchObject({ status: 'degraded', database: 'not writable' })
    // Reads still work.
    expect((await call('/api/worksheets?pageSize=5', admin)).status).toBe(200)
    expect((await call('/api/tools?pageSize=5', technician)).status).toBe(200)

    rmSync(filler())
    await expect.poll(async () => (await fetch(`${server.baseURL}/api/health`)).status, { timeout: 30_000 }).toBe(200)
    const after = await call('/api/worksheets', technician, { method: 'POST', body: { accumulatorId: units[0]!.id, workOrder: 'WO-FULL-AFTER', reason: 'scheduled' } })
    expect(after.status).toBe(201)
    // Nothing half-written: the audit trail vouches for every record.
    expect((await call('/api/audit/verify', admin)).body).toMatchObject({ ok: true, mismatches: 0, headProblems: [] })
  })
})
