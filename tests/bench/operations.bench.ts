/**
 * Operations figures on a fleet-like SQLite database (`npm run bench:operations`; a script that prints, not a
 * timed test): how long `npm run backup` and `npm run restore` take (the restore includes verifying the whole
 * audit trail), the sizes, and the bulk records archive's throughput (records a second) and the server's
 * resident-memory growth while it streams.
 *
 *   SCALE_WORKSHEETS=100000 ARCHIVE_RECORDS=10000 SCALE_DATABASE=/tmp/scale-{count}.sqlite npm run bench:operations
 *
 * The archive covers the oldest ARCHIVE_RECORDS released worksheets (a period, by their release dates).
 */
import { spawn, spawnSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setTimeout as pause } from 'node:timers/promises'
import sqlite3 from 'sqlite3'
import { freePort } from '../support/ports'
import { buildScaleDatabase } from './scale-database'

const root = join(import.meta.dirname, '../..')
const COUNT = Number(process.env.SCALE_WORKSHEETS ?? 100_000)
const ARCHIVE_RECORDS = Number(process.env.ARCHIVE_RECORDS ?? 10_000)
const TOKEN = randomBytes(16).toString('hex')

function task(name: string, args: string[], env: Record<string, string>): number {
  const started = performance.now()
  const run = spawnSync(process.execPath, ['scripts/task.mjs', name, ...args], { cwd: root, env: { ...process.env, ...env }, encoding: 'utf8' })
  if (run.status !== 0) throw new Error(`${name} failed:\n${run.stdout}\n${run.stderr}`)
  return (performance.now() - started) / 1000
}

/** The release date of the ARCHIVE_RECORDS-th oldest released worksheet: the archive's period ends there. */
function periodEnd(database: string): Promise<string> {
  return new Promise((done, fail) => {
    const db = new sqlite3.Database(database, sqlite3.OPEN_READONLY)
    db.get(`SELECT released_at AS at FROM worksheets WHERE state = 'released' ORDER BY released_at LIMIT 1 OFFSET ${ARCHIVE_RECORDS - 1}`, (error, row: { at: string } | undefined) => {
      db.close()
      if (error || !row) return fail(error ?? new Error('Too few released worksheets.'))
      done(String(row.at).slice(0, 10))
    })
  })
}

async function main() {
  const folder = mkdtempSync(join(tmpdir(), 'chargewell-operations-'))
  const kept = process.env.SCALE_DATABASE?.replaceAll('{count}', String(COUNT))
  const database = kept ?? join(folder, 'fleet.sqlite')
  const secretFile = `${database}.secret`
  let secret = kept && existsSync(secretFile) ? readFileSync(secretFile, 'utf8') : randomBytes(32).toString('hex')
  if (!kept || !existsSync(database)) {
    secret = randomBytes(32).toString('hex')
    console.log(`Building a database of ${COUNT} worksheets…`)
    const started = Date.now()
    await buildScaleDatabase(database, COUNT, secret, () => undefined)
    if (kept) writeFileSync(secretFile, secret)
    console.log(`Built in ${((Date.now() - started) / 1000).toFixed(0)} s.`)
  }
  const env = { NUXT_SESSION_PASSWORD: secret, NUXT_AUDIT_SECRET: '', NUXT_FAKE_SMTP: '', CHARGEWELL_OUTPUT: join(root, '.output') }
  try {
    const backupSeconds = task('db:backup', ['--out', join(folder, 'backups')], { ...env, NUXT_DB_PATH: database })
    const backupFolder = join(folder, 'backups', spawnSync('ls', [join(folder, 'backups')], { encoding: 'utf8' }).stdout.trim())
    const manifest = JSON.parse(readFileSync(join(backupFolder, 'manifest.json'), 'utf8'))
    const restored = join(folder, 'restored.sqlite')
    const restoreSeconds = task('db:restore', [backupFolder, '--to', restored], env)
    console.log(`Backup of ${COUNT} worksheets: ${backupSeconds.toFixed(1)} s (task start included), ${(manifest.file.bytes / 1e6).toFixed(0)} MB, ${manifest.audit.count} audit entries`)
    console.log(`Restore into a new database, migrated and the whole audit trail verified: ${restoreSeconds.toFixed(1)} s`)
    rmSync(restored, { force: true })

    const port = await freePort()
    const base = `http://127.0.0.1:${port}`
    const server = spawn(process.execPath, [join(root, '.output/server/index.mjs')], {
      env: { ...process.env, ...env, NODE_ENV: 'production', HOST: '127.0.0.1', PORT: String(port), NUXT_DB_PATH: database, NUXT_METRICS_TOKEN: TOKEN, NUXT_LOG_LEVEL: 'warn' },
      stdio: ['ignore', 'inherit', 'inherit'],
    })
    try {
      for (let tries = 0; !(await fetch(`${base}/api/health`).then(r => r.ok, () => false)); tries++) {
        if (tries > 600) throw new Error('The server did not start.')
        await pause(100)
      }
      const login = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'admin@chargewell.test', password: 'chargewell-demo' }) })
      const cookie = login.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
      const rss = async () => Number(/^process_resident_memory_bytes\{[^}]*\} (\d+)/m.exec(await (await fetch(`${base}/metrics`, { headers: { authorization: `Bearer ${TOKEN}` } })).text())![1])
      const to = await periodEnd(database)
      const archive = async (period: string) => {
        const response = await fetch(`${base}/api/records/archive?${period}`, { headers: { cookie } })
        const reader = response.body!.getReader()
        let bytes = 0
        for (let part = await reader.read(); !part.done; part = await reader.read()) bytes += part.value.length
        return bytes
      }
      await archive('from=2000-01-01&to=2000-01-31') // warm-up: nothing in it but the audit trail
      const before = await rss()
      let peak = before
      const sampler = setInterval(() => void rss().then(value => (peak = Math.max(peak, value)), () => undefined), 500)
      const started = performance.now()
      const bytes = await archive(`from=2000-01-01&to=${to}`)
      const seconds = (performance.now() - started) / 1000
      clearInterval(sampler)
      console.log(`Records archive of ~${ARCHIVE_RECORDS} released records (to ${to}): ${seconds.toFixed(0)} s, ${(ARCHIVE_RECORDS / seconds).toFixed(1)} records/s, ${(bytes / 1e6).toFixed(0)} MB; server RSS ${(before / 1e6).toFixed(0)} → peak ${(peak / 1e6).toFixed(0)} MB (+${((peak - before) / 1e6).toFixed(0)} MB)`)
    }
    finally {
      server.kill('SIGTERM')
    }
  }
  finally {
    rmSync(folder, { recursive: true, force: true })
    if (!kept) rmSync(database, { force: true })
  }
}

await main()
