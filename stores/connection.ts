import { defineStore } from 'pinia'

/** How long a heartbeat may take before the server counts as out of reach. */
const HEARTBEAT_TIMEOUT_MS = 6000
/** How often the server is asked while it answers, and while it does not. */
const ONLINE_EVERY_MS = 30_000
const OFFLINE_EVERY_MS = 5000

/**
 * Whether this device can reach Chargewell now. Decided by reaching the server, not by the
 * browser's flag: `navigator.onLine` stays true on Wi-Fi with no internet, and some Chromium
 * versions keep it true after the network is cut while the service worker serves the page. A
 * heartbeat runs at every page load, when the tab comes back into view, when the browser hints at a
 * change, and on a timer; any request that gets no answer at all marks the device offline at once
 * (plugins/connection.client.ts) and asks again shortly. Only a heartbeat brings it back online: an
 * answer the service worker gave from its cache is not the server.
 */
export const useConnectionStore = defineStore('connection', () => {
  const online = ref(true)
  /** When the server was last heard from, or last failed to answer (ISO), for "as of" wording. */
  const checkedAt = ref<string | null>(null)
  const checking = ref(false)
  let running: Promise<boolean> | null = null
  let slowAnswers = 0
  let timer: ReturnType<typeof setTimeout> | undefined

  function schedule(after: number) {
    clearTimeout(timer)
    timer = setTimeout(() => void check(), after)
  }

  /** Asks the server, once at a time; the answer decides the state. */
  function check(): Promise<boolean> {
    running ??= (async () => {
      checking.value = true
      try {
        // Any answer at all is the server: a 503 (its database in trouble) is still "connected".
        const answer = await fetch('/api/health', {
          cache: 'no-store',
          headers: { accept: 'application/json' },
          signal: AbortSignal.timeout(HEARTBEAT_TIMEOUT_MS),
        })
        // Read to the end: an unread body keeps the request open (and the page "busy") until the time-out.
        await answer.arrayBuffer()
        online.value = true
        slowAnswers = 0
      }
      catch (error) {
        // No network fails at once: offline now. A server that is only slow (a busy moment) is not
        // "no signal": offline after the second heartbeat in a row that gets no answer in time.
        const timedOut = (error as Error)?.name === 'TimeoutError'
        slowAnswers = timedOut ? slowAnswers + 1 : 0
        if (!timedOut || slowAnswers >= 2) online.value = false
      }
      finally {
        checking.value = false
        checkedAt.value = new Date().toISOString()
        running = null
        schedule(online.value ? ONLINE_EVERY_MS : OFFLINE_EVERY_MS)
      }
      return online.value
    })()
    return running
  }

  /** A request got no answer: offline now, and asked again soon. */
  function lost() {
    online.value = false
    schedule(OFFLINE_EVERY_MS)
  }

  if (import.meta.client) {
    void check()
    // The browser's events are hints: "offline" is believed at once, "online" is checked.
    window.addEventListener('offline', lost)
    window.addEventListener('online', () => void check())
    document.addEventListener('visibilitychange', () => {
      if (document.visibilityState === 'visible') void check()
    })
  }
  return { online, checkedAt, checking, check, lost }
})
