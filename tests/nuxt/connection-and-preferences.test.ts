import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { DEFAULT_PREFERENCES, type UserPreferences } from '#shared/types/user'
import { useConnectionStore } from '~~/stores/connection'
import { usePreferencesStore } from '~~/stores/preferences'
import { fakeServer, refusal, until } from './fake-server'

/**
 * The connection store decides "online" by reaching the server, never by the browser's flag; the preferences
 * store puts a refused change back as it was. Both in the Nuxt runtime against a fake server.
 */

let server: ReturnType<typeof fakeServer>
beforeEach(() => {
  server = fakeServer()
  setActivePinia(createPinia())
})

/** A fetch that answers as the test says: a status, no network, or a time-out. */
function heartbeat(answer: () => Response | Error) {
  vi.stubGlobal('fetch', async () => {
    const outcome = answer()
    if (outcome instanceof Error) throw outcome
    return outcome
  })
}
const timeout = () => new DOMException('The operation timed out.', 'TimeoutError')

describe('the connection', () => {
  it('is online when the server answers, whatever it answers (a 503 is a server in trouble, not no signal)', async () => {
    heartbeat(() => new Response('{"status":"starting"}', { status: 503 }))
    const connection = useConnectionStore()
    expect(await connection.check()).toBe(true)
    expect(connection.checkedAt).not.toBeNull()
  })

  it('is offline at once when the network gives no answer, and online again only by a heartbeat', async () => {
    let up = false
    heartbeat(() => (up ? new Response('{}') : new TypeError('Failed to fetch')))
    const connection = useConnectionStore()
    expect(await connection.check()).toBe(false)
    up = true
    // The browser's "online" event is a hint: the store asks the server before believing it.
    window.dispatchEvent(new Event('online'))
    await until(() => expect(connection.online).toBe(true))
  })

  it('believes a slow server once, and counts it out of reach at the second time-out in a row', async () => {
    let slow = false
    heartbeat(() => (slow ? timeout() : new Response('{}')))
    const connection = useConnectionStore()
    expect(await connection.check()).toBe(true)
    slow = true
    expect(await connection.check()).toBe(true)
    expect(await connection.check()).toBe(false)
  })

  it('asks once at a time: checks started together share one request', async () => {
    let requests = 0
    heartbeat(() => {
      requests += 1
      return new Response('{}')
    })
    const connection = useConnectionStore()
    await connection.check()
    requests = 0
    await Promise.all([connection.check(), connection.check(), connection.check()])
    expect(requests).toBe(1)
  })

  it('marks the device offline when a request gets no answer', () => {
    const connection = useConnectionStore()
    connection.lost()
    expect(connection.online).toBe(false)
  })
})

describe('the user’s preferences', () => {
  const metric: UserPreferences = { ...DEFAULT_PREFERENCES, pressureUnit: 'bar', temperatureUnit: 'C' }

  it('shows a change at once and keeps what the server answers', async () => {
    server.on('PATCH /api/me/preferences', ({ body }) => ({ preferences: body }))
    const preferences = usePreferencesStore()
    await preferences.save(metric)
    expect(preferences.preferences).toEqual(metric)
    expect(preferences.error).toBeNull()
  })

  it('puts a refused change back as it was, with the server’s reason', async () => {
    server.on('PATCH /api/me/preferences', () => {
      throw refusal(400, 'The pressure unit is one of psi, bar, kPa, MPa.')
    })
    const preferences = usePreferencesStore()
    const before = { ...preferences.preferences }
    await expect(preferences.save(metric)).rejects.toMatchObject({ statusCode: 400 })
    expect(preferences.preferences).toEqual(before)
    expect(preferences.error).toBe('The pressure unit is one of psi, bar, kPa, MPa.')
    expect(preferences.saving).toBe(false)
  })
})
