/**
 * Setup file of the `api` and `e2e` projects: every test file gets its own server and its own
 * copy of the seeded database, so no file depends on another's writes.
 */
import { afterAll, beforeAll } from 'vitest'
import { startTestServer, type TestServer } from './test-server'

let server: TestServer | undefined

/** This file's server. */
export function fileServer(): TestServer {
  if (!server) throw new Error('The file\'s server is not started yet (use it inside a test or hook).')
  return server
}

/** This file's server's address, e.g. http://127.0.0.1:40123. */
export function baseURL(): string {
  return fileServer().baseURL
}

beforeAll(async () => {
  server = await startTestServer()
}, 60_000)

afterAll(async () => {
  if (process.env.CHARGEWELL_KEEP_LOGS === '1') console.log(server?.log.join(''))
  await server?.dispose()
})
