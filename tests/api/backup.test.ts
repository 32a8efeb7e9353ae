/**
 * Backup and restore, as the person who runs Chargewell would do them: `npm run backup` while 9 writers keep
 * writing, then `npm run restore` into a new database. Every write acknowledged before the backup began is in
 * the restored database, a server started on it answers for it, and its audit trail verifies. A copy changed
 * after the backup, a truncated copy, a backup from newer code and a target that already exists are refused
 * in words, and nothing is left behind.
 */
import { spawn } from 'node:child_process'
import { cpSync, existsSync, readdirSync, readFileSync, truncateSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, inject, it, onTestFailed } from 'vitest'
import { DEMO, signInAt } from '../support/api'
import { createPostgresDatabase, dropPostgresDatabase, isPostgresUrl } from '../support/postgres'
import { startTestServer, type TestServer } from '../support/test-server'

let server: TestServer
const created: string[] = []
beforeAll(async () => {
  server = await startTestServer()
}, 60_000)
afterAll(async () => {
  await server?.dispose()
  for (const url of created) await dropPostgresDatabase(url)
})

/** `npm run backup` / `npm run restore` against the test server's database, as scripts/task.mjs runs them. */
function task(name: 'db:backup' | 'db:restore', args: string[]): Promise<{ code: number, output: string }> {
  const database = server.database
  return new Promise((done) => {
    const child = spawn(process.execPath, ['scripts/task.mjs', name, ...args], {
      env: {
        ...process.env,
        CHARGEWELL_OUTPUT: inject('outputDir'),
        NUXT_SESSION_PASSWORD: inject('sessionPassword'),
        NUXT_AUDIT_SECRET: '',
        NUXT_DB_PATH: isPostgresUrl(database) ? '' : database,
        NUXT_DATABASE_URL: isPostgresUrl(database) ? database : '',
        NUXT_FAKE_SMTP: '',
      },
    })
    let output = ''
    child.stdout.on('data', chunk => (output += chunk))
    child.stderr.on('data', chunk => (output += chunk))
    child.on('close', code => done({ code: code ?? 1, output }))
  })
}

async function call(baseURL: string, path: string, cookie: string, method = 'GET', body?: unknown) {
  const response = await fetch(`${baseURL}${path}`, { method, headers: { 'content-type': 'application/json', cookie }, body: body === undefined ? undefined : JSON.stringify(body) })
  return { status: response.status, body: await response.json() }
}

/** A new database to restore into: a file that does not exist yet, or an empty PostgreSQL database. */
async function newTarget(label: string): Promise<string> {
  if (!isPostgresUrl(server.database)) return join(server.folder, `${label}.sqlite`)
  const url = await createPostgresDatabase(server.database, `chargewell_restore_${label}_${Date.now()}`)
  created.push(url)
  return url
}

let backupFolder = ''

describe('backup and restore', () => {
  it('backs up while 9 writers write; the restore holds every acknowledged write and its trail verifies', { timeout: 180_000 }, async () => {
    onTestFailed(() => console.error(server.log.join('')))
    const technician = await signInAt(server.baseURL, DEMO.technician)
    const units = (await call(server.baseURL, '/api/accumulators?installed=true&pageSize=50', technician)).body.items as { id: number }[]
    const acknowledged: { id: number, at: number }[] = []
    let running = true
    const writer = async (lane: number) => {
      for (let index = 0; running; index++) {
        const answer = await call(server.baseURL, '/api/worksheets', technician, 'POST', { accumulatorId: units[(lane * 5 + index) % units.length]!.id, workOrder: `WO-BACKUP-${lane}-${index}`, reason: 'scheduled' })
        if (answer.status !== 201) throw new Error(`create answered ${answer.status}: ${JSON.stringify(answer.body)}`)
        const step = await call(server.baseURL, `/api/worksheets/${answer.body.id}`, technician, 'PATCH', { step: 'preparation', systemDepressurised: true, aircraftSafe: true })
        if (step.status !== 200) throw new Error(`step answered ${step.status}`)
        acknowledged.push({ id: answer.body.id, at: Date.now() })
      }
    }
    const lanes = Array.from({ length: 9 }, (_, lane) => writer(lane))
    // Under load, not after a time: the backup starts once the writers have been acknowledged a while.
    await expect.poll(() => acknowledged.length, { timeout: 60_000, interval: 50 }).toBeGreaterThan(30)
    const before = acknowledged.map(write => write.id)
    const backup = await task('db:backup', ['--out', join(server.folder, 'backups')])
    const during = acknowledged.length - before.length
    running = false
    await Promise.all(lanes)
    expect(backup.code, backup.output).toBe(0)
    // The writers kept being answered while the copy was taken (the server was not stopped or held).
    expect(during).toBeGreaterThan(0)
    backupFolder = readdirSync(join(server.folder, 'backups')).map(name => join(server.folder, 'backups', name))[0]!
    const manifest = JSON.parse(readFileSync(join(backupFolder, 'manifest.json'), 'utf8'))
    expect(manifest).toMatchObject({ format: 'chargewell-backup/1', migration: { level: expect.stringMatching(/^\d{4}-/) } })
    expect(manifest.audit.count).toBeGreaterThan(before.length)
    expect(manifest.file.sha256).toMatch(/^[0-9a-f]{64}$/)

    const target = await newTarget('whole')
    const restore = await task('db:restore', [backupFolder, '--to', target])
    expect(restore.code, restore.output).toBe(0)
    expect(restore.output).toMatch(/"auditEntriesVerified":\d+/)

    // A server on the restored database: every write acknowledged before the backup began is there.
    const restoredDatabase: Record<string, string> = isPostgresUrl(target)
      ? { NUXT_DATABASE_URL: target }
      : { NUXT_DB_PATH: target }
    const restored = await startTestServer(restoredDatabase)
    try {
      const admin = await signInAt(restored.baseURL, DEMO.admin)
      for (const id of before) {
        const worksheet = await call(restored.baseURL, `/api/worksheets/${id}`, admin)
        expect(worksheet.status, `worksheet ${id}`).toBe(200)
        expect(worksheet.body.content.preparation, `worksheet ${id}'s step`).toBeTruthy()
      }
      const verify = await call(restored.baseURL, '/api/audit/verify', admin)
      expect(verify.body.ok, JSON.stringify(verify.body)).toBe(true)
      expect(verify.body.checked).toBeGreaterThanOrEqual(manifest.audit.count)
    }
    finally {
      await restored.dispose()
    }
  })

  it('refuses a changed copy, a truncated one, one from newer code, and a target that exists', { timeout: 120_000 }, async () => {
    expect(backupFolder).not.toBe('')
    const copy = (label: string) => {
      const folder = join(server.folder, label)
      cpSync(backupFolder, folder, { recursive: true })
      return folder
    }
    const manifest = JSON.parse(readFileSync(join(backupFolder, 'manifest.json'), 'utf8'))

    const changed = copy('changed')
    const file = join(changed, manifest.file.name)
    const bytes = readFileSync(file)
    const middle = Math.floor(bytes.length / 2)
    bytes[middle] = bytes[middle]! ^ 0xff
    writeFileSync(file, bytes)
    const changedTarget = await newTarget('changed')
    const refusedChanged = await task('db:restore', [changed, '--to', changedTarget])
    expect(refusedChanged.code).not.toBe(0)
    expect(refusedChanged.output).toContain('SHA-256 does not match')

    const truncated = copy('truncated')
    truncateSync(join(truncated, manifest.file.name), Math.floor(manifest.file.bytes / 3))
    const refusedTruncated = await task('db:restore', [truncated, '--to', await newTarget('truncated')])
    expect(refusedTruncated.code).not.toBe(0)
    expect(refusedTruncated.output).toContain('truncated')

    const newer = copy('newer')
    const future = { ...manifest, migration: { level: '0099-from-the-future', count: 99 } }
    writeFileSync(join(newer, 'manifest.json'), JSON.stringify(future))
    const refusedNewer = await task('db:restore', [newer, '--to', await newTarget('newer')])
    expect(refusedNewer.code).not.toBe(0)
    expect(refusedNewer.output).toContain('newer code')

    // Nothing was restored by a refused restore.
    if (!isPostgresUrl(changedTarget)) expect(existsSync(changedTarget)).toBe(false)

    // Never over a database that is there: the server's own.
    const over = await task('db:restore', [backupFolder, '--to', server.database])
    expect(over.code).not.toBe(0)
    expect(over.output).toMatch(/already exists|not empty/)
  })
})
