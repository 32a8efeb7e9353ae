import { execFile } from 'node:child_process'
import { createHash } from 'node:crypto'
import { createReadStream, existsSync, mkdirSync, rmSync, statSync, writeFileSync, readFileSync } from 'node:fs'
import { basename, join, resolve } from 'node:path'
import { promisify } from 'node:util'
import pg from 'pg'
import sqlite3 from 'sqlite3'
import { ENGINE_VERSION } from '#shared/gas/version'
import { isPostgresUrl } from '../database/connection'
import { MIGRATION_NAMES } from '../database/migrate'
import { AuditEvent } from '../models'
import { verifyTrail } from './audit'

/**
 * Backup and restore. A backup is a folder: the copy (`database.sqlite`, taken with SQLite's online backup
 * API in one step, so it is one consistent moment while the server keeps writing; or `database.pgdump`, taken
 * by pg_dump inside an exported snapshot) and `manifest.json` — when, which engine and migration level, the
 * audit chain's head and count as they are in the copy, and the copy's SHA-256. A restore checks all of that,
 * refuses a copy that does not match or comes from newer code, restores into a database that must be new,
 * and verifies the audit trail there before it says it succeeded (and removes what it restored if not).
 */

const run = promisify(execFile)
export const MANIFEST_FORMAT = 'chargewell-backup/1'

export interface BackupManifest {
  format: typeof MANIFEST_FORMAT
  createdAt: string
  engineVersion: string
  dialect: 'sqlite' | 'postgres'
  migration: { level: string, count: number }
  audit: { count: number, lastEventId: number | null, lastHash: string | null }
  file: { name: string, bytes: number, sha256: string }
}

export class BackupRefused extends Error {
  override name = 'BackupRefused'
}

function sha256Of(path: string): Promise<string> {
  return new Promise((done, fail) => {
    const hash = createHash('sha256')
    createReadStream(path).on('data', chunk => hash.update(chunk)).on('error', fail).on('end', () => done(hash.digest('hex')))
  })
}

interface Facts {
  migration: BackupManifest['migration']
  audit: BackupManifest['audit']
}

/** The migration level and the audit head, read from one database through `query`. */
async function factsOf(query: (sql: string) => Promise<Record<string, unknown>[]>): Promise<Facts> {
  const migrations = (await query('SELECT name FROM schema_migrations')).map(row => String(row.name))
  const level = MIGRATION_NAMES.filter(name => migrations.includes(name)).at(-1)
    ?? migrations.sort().at(-1) ?? 'none'
  const [count] = await query('SELECT COUNT(*) AS n FROM audit_events')
  const [last] = await query('SELECT id, hash FROM audit_events ORDER BY id DESC LIMIT 1')
  return {
    migration: { level, count: migrations.length },
    audit: {
      count: Number(count?.n ?? 0),
      lastEventId: last ? Number(last.id) : null,
      lastHash: last ? String(last.hash) : null,
    },
  }
}

function sqliteQuery(database: sqlite3.Database) {
  return (sql: string) => new Promise<Record<string, unknown>[]>((done, fail) =>
    database.all(sql, (error, rows) => (error ? fail(error) : done(rows as Record<string, unknown>[]))))
}

interface OnlineBackup {
  step: (pages: number, done: (error: Error | null) => void) => void
  finish: (done: (error: Error | null) => void) => void
  completed: boolean
  failed: boolean
}

/** A consistent copy of the SQLite file at `source` into `target`, in one step of the online backup API. */
async function copySqlite(source: string, target: string): Promise<void> {
  const database = new sqlite3.Database(source, sqlite3.OPEN_READONLY)
  try {
    await new Promise<void>((done, fail) => database.run('PRAGMA busy_timeout = 15000', error => (error ? fail(error) : done())))
    // node-sqlite3's binding of sqlite3_backup_* (its typings leave it out).
    const backup = (database as unknown as { backup: (file: string) => OnlineBackup }).backup(target)
    await new Promise<void>((done, fail) => backup.step(-1, error => (error ? fail(error) : done())))
    await new Promise<void>((done, fail) => backup.finish(error => (error ? fail(error) : done())))
    if (!backup.completed || backup.failed) throw new Error('The online backup did not complete.')
  }
  finally {
    await new Promise<void>(done => database.close(() => done()))
  }
}

async function sqliteFacts(path: string): Promise<Facts> {
  const database = new sqlite3.Database(path, sqlite3.OPEN_READONLY)
  try {
    return await factsOf(sqliteQuery(database))
  }
  finally {
    await new Promise<void>(done => database.close(() => done()))
  }
}

/** pg_dump of one snapshot, and the facts read in that same snapshot. */
async function dumpPostgres(url: string, target: string): Promise<Facts> {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    await client.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY')
    const { rows: [snapshot] } = await client.query<{ id: string }>('SELECT pg_export_snapshot() AS id')
    const facts = await factsOf(async sql => (await client.query(sql)).rows)
    await run('pg_dump', ['--format=custom', '--no-owner', `--snapshot=${snapshot!.id}`, `--file=${target}`, url], { maxBuffer: 64 * 1024 * 1024 })
    await client.query('COMMIT')
    return facts
  }
  finally {
    await client.end()
  }
}

/** Takes a backup of the configured database into a new folder under `outDir`; answers its manifest. */
export async function takeBackup(location: string, outDir: string) {
  const createdAt = new Date()
  const folder = resolve(outDir, `chargewell-backup-${createdAt.toISOString().replace(/[:.]/g, '-')}`)
  mkdirSync(folder, { recursive: true })
  try {
    const postgres = isPostgresUrl(location)
    const name = postgres ? 'database.pgdump' : 'database.sqlite'
    const file = join(folder, name)
    let facts: Facts
    if (postgres) facts = await dumpPostgres(location, file)
    else {
      await copySqlite(location, file)
      facts = await sqliteFacts(file)
    }
    const manifest: BackupManifest = {
      format: MANIFEST_FORMAT,
      createdAt: createdAt.toISOString(),
      engineVersion: ENGINE_VERSION,
      dialect: postgres ? 'postgres' : 'sqlite',
      ...facts,
      file: { name, bytes: statSync(file).size, sha256: await sha256Of(file) },
    }
    writeFileSync(join(folder, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`)
    return { folder, manifest: manifest as BackupManifest }
  }
  catch (error) {
    rmSync(folder, { recursive: true, force: true })
    throw error
  }
}

/** The manifest, if the folder's copy is whole and this code may restore it; otherwise why not, in words. */
export async function checkBackup(folder: string): Promise<BackupManifest> {
  const manifestPath = join(folder, 'manifest.json')
  if (!existsSync(manifestPath)) throw new BackupRefused(`${folder} holds no manifest.json: not a Chargewell backup.`)
  let manifest: BackupManifest
  try {
    manifest = JSON.parse(readFileSync(manifestPath, 'utf8')) as BackupManifest
  }
  catch {
    throw new BackupRefused('The manifest is not readable JSON: the backup is damaged.')
  }
  if (manifest.format !== MANIFEST_FORMAT) throw new BackupRefused(`The manifest's format is ${String(manifest.format)}, not ${MANIFEST_FORMAT}.`)
  const file = join(folder, basename(manifest.file?.name ?? ''))
  if (!manifest.file?.name || !existsSync(file)) throw new BackupRefused(`The copy ${manifest.file?.name ?? '(unnamed)'} is missing from the backup.`)
  const bytes = statSync(file).size
  if (bytes !== manifest.file.bytes) {
    throw new BackupRefused(`The copy is ${bytes} bytes, the manifest says ${manifest.file.bytes}: it was truncated or changed.`)
  }
  if ((await sha256Of(file)) !== manifest.file.sha256) {
    throw new BackupRefused('The copy\'s SHA-256 does not match the manifest: it was changed after the backup was taken.')
  }
  const known = MIGRATION_NAMES.indexOf(manifest.migration?.level)
  if (known === -1 && manifest.migration?.level !== 'none') {
    throw new BackupRefused(`The backup is at migration ${manifest.migration?.level}, which this Chargewell does not know: it comes from newer code. Restore it with that version or later.`)
  }
  return manifest
}

/**
 * Restores a checked backup into `target` (an SQLite path that must not exist, or an empty PostgreSQL
 * database). Opening it afterwards (the caller's `useDB`) migrates it up to this code's level.
 */
export async function restoreCopy(folder: string, manifest: BackupManifest, target: string): Promise<void> {
  const file = join(folder, basename(manifest.file.name))
  if (isPostgresUrl(target) !== (manifest.dialect === 'postgres')) {
    throw new BackupRefused(`This is a ${manifest.dialect} backup: restore it into ${manifest.dialect === 'postgres' ? 'a PostgreSQL database (NUXT_DATABASE_URL)' : 'an SQLite file (NUXT_DB_PATH)'}.`)
  }
  if (manifest.dialect === 'sqlite') {
    if (existsSync(target)) throw new BackupRefused(`${target} already exists: a restore goes into a new database, never over one.`)
    mkdirSync(resolve(target, '..'), { recursive: true })
    await copySqlite(file, target)
    return
  }
  const client = new pg.Client({ connectionString: target })
  await client.connect()
  try {
    const { rows: [tables] } = await client.query<{ n: string }>('SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = \'public\'')
    if (Number(tables!.n) > 0) throw new BackupRefused('The target database is not empty: a restore goes into a new database, never over one.')
  }
  finally {
    await client.end()
  }
  await run('pg_restore', ['--no-owner', '--exit-on-error', `--dbname=${target}`, file], { maxBuffer: 64 * 1024 * 1024 })
}

/** After the restored database is open: its audit trail verifies and holds the backup's head, or the restore failed. */
export async function verifyRestored(manifest: BackupManifest): Promise<{ checked: number }> {
  const report = await verifyTrail()
  if (!report.ok) {
    const why = report.firstBroken?.reason ?? (report.headProblems.join('; ') || report.firstMismatch?.reason)
    throw new BackupRefused(`The restored audit trail does not verify: ${why || JSON.stringify(report)}`)
  }
  if (manifest.audit.lastEventId !== null) {
    const last = await AuditEvent.findByPk(manifest.audit.lastEventId)
    if (last?.hash !== manifest.audit.lastHash) throw new BackupRefused('The restored trail does not hold the backup\'s last audit entry.')
  }
  if (report.checked < manifest.audit.count) {
    throw new BackupRefused(`The restored trail holds ${report.checked} entries; the backup had ${manifest.audit.count}.`)
  }
  return { checked: report.checked }
}

/** Removes what a failed restore left (the new SQLite file and its journal). */
export function removeRestored(target: string): void {
  if (isPostgresUrl(target)) return
  for (const suffix of ['', '-wal', '-shm', '-journal']) rmSync(`${target}${suffix}`, { force: true })
}
