/**
 * The server is ready only once its start-up work has ended (server/utils/readiness.ts): /api/health
 * answers 503 "starting" until then. A failed warm-up only costs time, so it still ends in "ready".
 */
import { describe, expect, it, vi } from 'vitest'

describe('readiness', () => {
  it('is not ready while the start-up work runs, and is once it ends', async () => {
    vi.resetModules()
    const { isReady, startUp } = await import('../../server/utils/readiness')
    let finish!: () => void
    startUp(() => new Promise<void>(done => (finish = done)))
    await Promise.resolve()
    expect(isReady()).toBe(false)
    finish()
    await vi.waitFor(() => expect(isReady()).toBe(true))
  })

  it('is ready after a warm-up that failed, and says so in the log', async () => {
    vi.resetModules()
    const { isReady, startUp } = await import('../../server/utils/readiness')
    const logged = vi.spyOn(console, 'error').mockImplementation(() => undefined)
    startUp(() => Promise.reject(new Error('no page')))
    await vi.waitFor(() => expect(isReady()).toBe(true))
    expect(logged.mock.calls[0]?.[0]).toMatch(/warm-up failed/)
    logged.mockRestore()
  })
})
