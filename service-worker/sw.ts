/**
 * Chargewell's service worker. It keeps the app on the device (the built files precached; pages from the
 * network first, else the app shell; the session kept for a start with no signal), and it sends the
 * device's queue when the connection returns — with no page of the app open. With a page open it asks the
 * page to send, so that the page's copy of the queue stays the one it shows.
 */
import { del, get, set } from 'idb-keyval'
import { clientsClaim } from 'workbox-core'
import { ExpirationPlugin } from 'workbox-expiration'
import { cleanupOutdatedCaches, PrecacheFallbackPlugin, precacheAndRoute } from 'workbox-precaching'
import { registerRoute } from 'workbox-routing'
import { NetworkFirst } from 'workbox-strategies'
import {
  DEVICE_QUEUE_KEY, DEVICE_QUEUE_LOCK, DEVICE_QUEUE_SYNC_TAG, EMPTY_DEVICE_QUEUE, type DeviceQueue,
} from '../shared/types/device-queue'
import { noAnswer, sendDeviceQueue, type SendFailure, type Sender } from '../shared/utils/device-send'

interface ExtendableEventLike extends Event {
  waitUntil: (promise: Promise<unknown>) => void
}
interface SyncEventLike extends ExtendableEventLike {
  tag: string
}
interface WorkerScope {
  skipWaiting: () => Promise<void>
  clients: {
    matchAll: (options: { type: 'window', includeUncontrolled: boolean }) =>
    Promise<{ postMessage: (message: unknown, transfer: Transferable[]) => void }[]>
  }
  addEventListener: (type: string, listener: (event: SyncEventLike) => void) => void
  navigator: Navigator
}
const worker = self as unknown as WorkerScope

void worker.skipWaiting()
clientsClaim()
// workbox-build finds this exact text and puts the list of built files in its place.
// @ts-expect-error the injection point exists only in the built worker
precacheAndRoute(self.__WB_MANIFEST)
cleanupOutdatedCaches()

registerRoute(
  ({ request }) => request.mode === 'navigate',
  new NetworkFirst({
    cacheName: 'chargewell-pages',
    networkTimeoutSeconds: 6,
    plugins: [new ExpirationPlugin({ maxEntries: 40 }), new PrecacheFallbackPlugin({ fallbackURL: '/app-shell' })],
  }),
)
registerRoute(
  ({ url }) => url.pathname === '/api/_auth/session' || url.pathname === '/api/me',
  new NetworkFirst({ cacheName: 'chargewell-session', networkTimeoutSeconds: 6 }),
)

/** A request the way the app's fetch fails: no `statusCode` when nothing answered, the server's body when refused. */
async function request<T>(path: string, init: RequestInit): Promise<T> {
  let answer: Response
  try {
    answer = await fetch(path, { ...init, credentials: 'same-origin', cache: 'no-store' })
  }
  catch (error) {
    throw { message: String(error) } satisfies SendFailure
  }
  const body = await answer.json().catch(() => undefined)
  if (!answer.ok) throw { statusCode: answer.status, message: body?.message, data: body } satisfies SendFailure
  return body as T
}

/** Asks an open page to send the queue; answers how much it could not send (Infinity when it does not say). */
function askPageToSend(page: { postMessage: (message: unknown, transfer: Transferable[]) => void }): Promise<number> {
  return new Promise((resolve) => {
    const channel = new MessageChannel()
    const timer = setTimeout(() => resolve(Number.POSITIVE_INFINITY), 30_000)
    channel.port1.onmessage = (event) => {
      clearTimeout(timer)
      resolve(Number(event.data?.left ?? Number.POSITIVE_INFINITY))
    }
    page.postMessage({ type: 'send-queue' }, [channel.port2])
  })
}

/** Sends the signed-in user's queue from IndexedDB; rejects while something is left for lack of an answer (retried). */
async function sendQueue(): Promise<void> {
  const pages = await worker.clients.matchAll({ type: 'window', includeUncontrolled: true })
  if (pages.length) {
    // A page sends (its copy of the queue is the one it shows); the sync counts as done only when nothing is left.
    const left = await Promise.all(pages.map(page => askPageToSend(page)))
    if (left.some(count => count > 0)) throw new Error('Not all sent yet: the browser tries the queue again later.')
    return
  }
  await worker.navigator.locks.request(DEVICE_QUEUE_LOCK, async () => {
    const held = await get<DeviceQueue>(DEVICE_QUEUE_KEY)
    if (!held) return
    // Only the work of whoever is signed in on this device goes, under their own session.
    const session = await request<{ user?: { id: number } }>('/api/_auth/session', { headers: { accept: 'application/json' } })
    if (!session.user) return
    const queue: DeviceQueue = { ...structuredClone(EMPTY_DEVICE_QUEUE), ...held }
    let lostConnection = false
    await sendDeviceQueue(queue, session.user.id, {
      json: <T>(path: string, init: Parameters<Sender['json']>[1]) => request<T>(path, {
        method: init.method,
        body: JSON.stringify(init.body),
        headers: { 'content-type': 'application/json', 'accept': 'application/json', ...init.headers },
      }).catch((failure) => {
        lostConnection ||= noAnswer(failure)
        throw failure
      }),
      form: (path, form) => request(path, { method: 'POST', body: form, headers: { accept: 'application/json' } }).catch((failure) => {
        lostConnection ||= noAnswer(failure)
        throw failure
      }),
      photo: key => get<Blob>(key).then(blob => blob ?? null),
      dropPhoto: key => del(key),
      save: changed => set(DEVICE_QUEUE_KEY, { ...changed, workerRevision: (changed.workerRevision ?? 0) + 1 }),
    })
    if (lostConnection) throw new Error('No connection yet: the browser tries the queue again later.')
  })
}

worker.addEventListener('sync', (event) => {
  if (event.tag === DEVICE_QUEUE_SYNC_TAG) event.waitUntil(sendQueue())
})
