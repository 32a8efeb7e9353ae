/**
 * Global setup for the `api` and `e2e` projects: builds the app once, copies `.output` to a
 * temporary folder (so a bundling mistake that only shows outside the repo fails here),
 * seeds a temporary database with the seed script, starts the built server on a free port
 * and waits for /api/health. The server is stopped at teardown, and also when the setup
 * itself fails. Both projects share the one server.
 *
 * CHARGEWELL_SKIP_BUILD=1 reuses an existing .output (for quick local runs).
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { cpSync, existsSync, mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import type { TestProject } from 'vitest/node'

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string
    databasePath: string
  }
}

interface SharedServer {
  users: number
  baseURL: string
  databasePath: string
  folder: string
  child: ChildProcess
  log: string[]
}

const shared = globalThis as typeof globalThis & { __chargewellServer?: Promise<SharedServer> }
const root = resolve(import.meta.dirname, '../..')

function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const probe = createServer()
    probe.once('error', fail)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      probe.close(() => typeof address === 'object' && address ? done(address.port) : fail(new Error('no port')))
    })
  })
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
    await new Promise(wait => setTimeout(wait, 250))
  }
  throw new Error(`The server did not answer /api/health within 30 s:\n${log.join('')}`)
}

async function start(): Promise<SharedServer> {
  if (process.env.CHARGEWELL_SKIP_BUILD !== '1' || !existsSync(join(root, '.output/server/index.mjs'))) {
    execFileSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit' })
  }
  const folder = mkdtempSync(join(tmpdir(), 'chargewell-test-'))
  cpSync(join(root, '.output'), join(folder, 'output'), { recursive: true })
  const databasePath = join(folder, 'test.sqlite')
  execFileSync('npx', ['tsx', 'server/database/seed.ts'], { cwd: root, env: { ...process.env, NUXT_DB_PATH: databasePath }, stdio: 'inherit' })
  const port = await freePort()
  const baseURL = `http://127.0.0.1:${port}`
  const log: string[] = []
  const child = spawn(process.execPath, [join(folder, 'output/server/index.mjs')], {
    cwd: folder,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      NUXT_DB_PATH: databasePath,
      NUXT_UPLOADS_DIR: join(folder, 'uploads'),
      NUXT_SESSION_PASSWORD: randomBytes(32).toString('hex'),
      NUXT_FAKE_SMTP: 'fake',
      NUXT_FAKE_SMTP_PORT: String(await freePort()),
      NUXT_PUBLIC_URL: baseURL,
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
    rmSync(folder, { recursive: true, force: true })
    throw error
  }
  return { users: 0, baseURL, databasePath, folder, child, log }
}

export default async function setup(project: TestProject) {
  shared.__chargewellServer ??= start()
  let server: SharedServer
  try {
    server = await shared.__chargewellServer
  }
  catch (error) {
    shared.__chargewellServer = undefined
    throw error
  }
  server.users++
  project.provide('baseURL', server.baseURL)
  project.provide('databasePath', server.databasePath)
  return async () => {
    if (--server.users > 0) return
    server.child.kill('SIGTERM')
    await new Promise(done => setTimeout(done, 300))
    if (server.child.exitCode === null) server.child.kill('SIGKILL')
    rmSync(server.folder, { recursive: true, force: true })
    shared.__chargewellServer = undefined
  }
}
