import { vi } from 'vitest'

/** A request as the store sent it. */
export interface SentRequest {
  url: string
  method: string
  body: unknown
  headers: Record<string, string>
  query: Record<string, unknown>
}

type Handler = (request: SentRequest) => unknown

/** A server's refusal as `$fetch` throws it: a status, and the message in `data`. */
export function refusal(statusCode: number, message: string) {
  return Object.assign(new Error(message), { statusCode, data: { message } })
}

/**
 * The network and server a store talks to, in place of `$fetch` and `fetch`: answers by method and
 * path, every request kept in order, and a switch for "no signal" (no answer at all, as the browser
 * gives it: no status). `/api/health` answers while there is a network.
 */
export function fakeServer() {
  const handlers = new Map<string, Handler>()
  const sent: SentRequest[] = []
  const network = { up: true }

  type Options = { method?: string, body?: unknown, headers?: Record<string, string>, query?: Record<string, unknown> }
  vi.stubGlobal('$fetch', async (url: string, options: Options = {}) => {
    const request = {
      url,
      method: (options.method ?? 'GET').toUpperCase(),
      body: options.body,
      headers: options.headers ?? {},
      query: { ...options.query },
    }
    if (!network.up) throw new TypeError('fetch failed')
    sent.push(request)
    const handler = handlers.get(`${request.method} ${url}`)
    if (!handler) throw refusal(404, `No fake answer for ${request.method} ${url}.`)
    return handler(request)
  })
  vi.stubGlobal('fetch', async (url: string) => {
    if (!network.up) throw new TypeError('Failed to fetch')
    return new Response(url === '/api/health' ? '{"status":"ok"}' : '{}', { status: 200 })
  })

  return {
    sent,
    network,
    /** Answers `method path` with what the handler returns, or throws. */
    on(route: string, handler: Handler) {
      handlers.set(route, handler)
    },
  }
}

/**
 * Waits until the check passes: a condition, never a time. The ceiling is generous (vitest's own is 1 s) so a
 * machine with every core busy only makes a test slower, never a failure.
 */
export function until<T>(check: () => T | Promise<T>): Promise<T> {
  return vi.waitFor(check, { timeout: 15_000, interval: 20 })
}
