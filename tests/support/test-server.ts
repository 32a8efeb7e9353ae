/**
 * A built Chargewell server on its own copy of the seeded template database, on a free port.
 * Each test file gets one (tests/support/file-server.ts); a test that needs to kill or restart
 * a server starts its own.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { inject } from 'vitest'
import { freePort } from './ports'
import { copyPostgresDatabase, dropPostgresDatabase, isPostgresUrl } from './postgres'

export interface TestServer {
  baseURL: string
  /** The SQLite file, or the postgres:// URL, this server uses. */
  database: string
  folder: string
  log: string[]
  /** Starts the server (again) on the same database and port. */
  start: () => Promise<void>
  /** Stops it: SIGTERM, or SIGKILL at once with `kill: true` (a crash). */
  stop: (options?: { kill?: boolean }) => Promise<void>
  /** Stops it and removes its folder. */
  dispose: () => Promise<void>
}

async function waitForHealth(baseURL: string, child: ChildProcess, log: string[]): Promise<void> {
  const deadline = Date.now() + 30_000
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited with ${child.exitCode}:\n${log.join('')}`)
    try {
      const response = await fetch(`${baseURL}/api/health`)
      if (response.ok) return
    }
    catch { /* not listening yet */ }
    await new Promise(wait => setTimeout(wait, 100))
  }
  throw new Error(`The server did not answer /api/health within 30 s:\n${log.join('')}`)
}

export async function startTestServer(env: Record<string, string> = {}): Promise<TestServer> {
  const folder = mkdtempSync(join(tmpdir(), 'chargewell-server-'))
  const template = inject('templateDatabase')
  let database = join(folder, 'chargewell.sqlite')
  if (isPostgresUrl(template)) database = await copyPostgresDatabase(template)
  else copyFileSync(template, database)
  const port = await freePort()
  const baseURL = `http://127.0.0.1:${port}`
  const smtpPort = await freePort()
  const log: string[] = []
  let child: ChildProcess | undefined

  const start = async () => {
    child = spawn(process.execPath, [join(inject('outputDir'), 'server/index.mjs')], {
      cwd: folder,
      env: {
        ...process.env,
        NODE_ENV: 'production',
        HOST: '127.0.0.1',
        PORT: String(port),
        NUXT_DB_PATH: isPostgresUrl(database) ? '' : database,
        NUXT_DATABASE_URL: isPostgresUrl(database) ? database : '',
        NUXT_UPLOADS_DIR: join(folder, 'uploads'),
        NUXT_SESSION_PASSWORD: inject('sessionPassword'),
        NUXT_AUDIT_SECRET: '',
        NUXT_FAKE_SMTP: 'fake',
        NUXT_FAKE_SMTP_PORT: String(smtpPort),
        NUXT_PUBLIC_URL: baseURL,
        NUXT_ALLOW_LOOPBACK_LABELS: 'true',
        NUXT_OPERATOR_NAME: 'Fellmoor Regional',
        NUXT_STATION_NAME: 'Fellmoor main base',
        ...env,
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    child.stdout?.on('data', chunk => log.push(String(chunk)))
    child.stderr?.on('data', chunk => log.push(String(chunk)))
    try {
      await waitForHealth(baseURL, child, log)
    }
    catch (error) {
      child.kill('SIGKILL')
      throw error
    }
  }
  const stop = async ({ kill = false } = {}) => {
    const running = child
    if (!running || running.exitCode !== null || running.signalCode !== null) return
    const exited = new Promise(done => running.once('exit', done))
    running.kill(kill ? 'SIGKILL' : 'SIGTERM')
    const timer = setTimeout(() => running.kill('SIGKILL'), 3000)
    await exited
    clearTimeout(timer)
  }
  const dispose = async () => {
    await stop()
    rmSync(folder, { recursive: true, force: true })
    if (isPostgresUrl(database)) await dropPostgresDatabase(database)
  }
  try {
    await start()
  }
  catch (error) {
    await dispose()
    throw error
  }
  return { baseURL, database, folder, log, start, stop, dispose }
}
