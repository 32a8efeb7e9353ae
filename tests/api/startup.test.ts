/**
 * A server that cannot start properly stops at once with a message and exit code 1, so a
 * supervisor (or a test harness) sees it, instead of living on without serving anything.
 */
import { describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { startTestServer } from '../support/test-server'

async function failureOf(env: Record<string, string>): Promise<string> {
  try {
    const server = await startTestServer(env)
    await server.dispose()
  }
  catch (error) {
    return String(error)
  }
  throw new Error('The server started, but it should have refused to.')
}

describe('starting the server', () => {
  it('exits with 1 and says why when its port is taken', async () => {
    const failure = await failureOf({ PORT: new URL(baseURL()).port })
    expect(failure).toContain('exited with 1')
    expect(failure).toContain('cannot listen on port')
    expect(failure).toContain('EADDRINUSE')
  })

  it('exits with 1 and says how to fix it without a session password', async () => {
    const failure = await failureOf({ NUXT_SESSION_PASSWORD: 'too-short' })
    expect(failure).toContain('exited with 1')
    expect(failure).toContain('NUXT_SESSION_PASSWORD is not set')
  })
})
