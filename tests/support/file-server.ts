/**
 * Setup file of the `api` and `e2e` projects: every test file gets its own built server, started
 * by @nuxt/test-utils, on its own copy of the seeded database, so no file depends on another's
 * writes and files pass alone and in any order. (A test that must kill a server with SIGKILL and
 * restart it on the same database starts its own: tests/support/test-server.ts.)
 */
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setup, useTestContext } from '@nuxt/test-utils/e2e'
import { afterAll, beforeAll, inject } from 'vitest'
import { copyPostgresDatabase, dropPostgresDatabase, isPostgresUrl } from './postgres'
import { freePort } from './ports'

const folder = mkdtempSync(join(tmpdir(), 'chargewell-file-'))
const template = inject('templateDatabase')
const database = isPostgresUrl(template) ? await copyPostgresDatabase(template) : join(folder, 'chargewell.sqlite')
if (!isPostgresUrl(template)) copyFileSync(template, database)
const port = await freePort()
let address: string | undefined

/** This file's database: the SQLite file, or the postgres:// URL. */
export function fileDatabase(): string {
  return database
}

// Registered before the server's own hooks, so it runs after the server has stopped (after-hooks run in reverse).
afterAll(async () => {
  if (process.env.CHARGEWELL_KEEP_LOGS === '1') console.log(serverLogs.join('\n'))
  rmSync(folder, { recursive: true, force: true })
  if (isPostgresUrl(database)) await dropPostgresDatabase(database)
})

/** This file's server's address, e.g. http://127.0.0.1:40123. */
export function baseURL(): string {
  if (!address) throw new Error('The file\'s server is not started yet (use it inside a test or hook).')
  return address
}

await setup({
  // The app is built once for every file (tests/support/global-setup.ts): no fixture to load, no build here.
  fixture: '',
  build: false,
  server: true,
  port,
  setupTimeout: 60_000,
  // Shorter than the hook's timeout, so a server that never answers fails with its own log, not a bare timeout.
  serverStartTimeout: 45_000,
  nuxtConfig: { nitro: { output: { dir: inject('outputDir') } } },
  env: {
    NODE_ENV: 'production',
    NUXT_DB_PATH: isPostgresUrl(database) ? '' : database,
    NUXT_DATABASE_URL: isPostgresUrl(database) ? database : '',
    NUXT_UPLOADS_DIR: join(folder, 'uploads'),
    NUXT_SESSION_PASSWORD: inject('sessionPassword'),
    NUXT_AUDIT_SECRET: '',
    NUXT_FAKE_SMTP: 'fake',
    NUXT_FAKE_SMTP_PORT: String(await freePort()),
    NUXT_PUBLIC_URL: `http://127.0.0.1:${port}`,
    NUXT_ALLOW_LOOPBACK_LABELS: 'true',
    NUXT_OPERATOR_NAME: 'Fellmoor Regional',
    NUXT_STATION_NAME: 'Fellmoor main base',
  },
})

let serverLogs: string[] = []
beforeAll(() => {
  // Kept here: the test context is only set while a test runs, and hooks of later describes need the address too.
  const context = useTestContext()
  address = context.url!.replace(/\/$/, '')
  serverLogs = context.serverLogs ?? []
})
