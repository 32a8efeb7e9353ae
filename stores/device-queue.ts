import { useIDBKeyval } from '@vueuse/integrations/useIDBKeyval'
import { del, get, set } from 'idb-keyval'
import { defineStore, skipHydrate } from 'pinia'
import type { Pressure } from '#shared/gas/types'
import type { WorksheetCreateBody, WorksheetStepBody } from '#shared/schemas/worksheet'
import {
  DEVICE_QUEUE_KEY, DEVICE_QUEUE_LOCK, DEVICE_QUEUE_SYNC_TAG, EMPTY_DEVICE_QUEUE,
  type DeviceQueue, type QueuedPhoto, type SentWorksheet,
} from '#shared/types/device-queue'
import type { FieldReference } from '#shared/types/field'
import type { InstalledUnitDto } from '#shared/types/fleet'
import type { SpecificationDto } from '#shared/types/registers'
import type { WorksheetDto, WorksheetView } from '#shared/types/worksheet'
import { stationDate } from '#shared/utils/station-time'
import { freezeWorksheetContent, settleUntil } from '#shared/utils/worksheet-content'
import type { StepRefusal } from '#shared/utils/worksheet-steps'
import { useConnectionStore } from './connection'
import { useFieldReferenceStore } from './field-reference'

type StepName = WorksheetStepBody['step']
export type { LocalWorksheet, QueuedPhoto, RefusedStep, SentWorksheet } from '#shared/types/device-queue'

/** The record without one key (a new object: the store is watched deeply). */
const without = <T>(record: Record<string, T>, key: string | number): Record<string, T> =>
  Object.fromEntries(Object.entries(record).filter(([candidate]) => candidate !== String(key)))

const EMPTY: DeviceQueue = EMPTY_DEVICE_QUEUE
const plain = <T>(value: T): T => JSON.parse(JSON.stringify(value))

/** No answer at all (the browser's own flag is not consulted: it says "online" on Wi-Fi with no internet). */
const noAnswer = (failure: unknown) => (failure as { statusCode?: number })?.statusCode === undefined

/** Runs `send` holding the queue's Web Lock (shared with the service worker); at once where locks are missing. */
function withSendLock<T>(send: () => Promise<T>): Promise<T> {
  return navigator.locks ? navigator.locks.request(DEVICE_QUEUE_LOCK, send) as Promise<T> : send()
}

/** Asks the service worker to send the queue when the connection returns, whether or not the app is open then. */
function askToSendLater() {
  type WithSync = ServiceWorkerRegistration & { sync?: { register: (tag: string) => Promise<void> } }
  navigator.serviceWorker?.ready
    .then(registration => (registration as WithSync).sync?.register(DEVICE_QUEUE_SYNC_TAG))
    .catch(() => { /* no background sync in this browser: the page sends when it is open */ })
}

/** A refusal of the shared step rules, shaped like the server's answer so forms show it the same way. */
function asApiFailure(refusal: StepRefusal) {
  const field = refusal.field
  return Object.assign(new Error(refusal.message), {
    statusCode: refusal.status,
    data: {
      message: refusal.message,
      data: {
        ...(field ? { issues: [{ path: field.split('.'), field, message: refusal.message }] } : {}),
        ...refusal.extra,
      },
    },
  })
}

/**
 * Work on this device: step forms as typed, steps waiting for a connection, worksheets started
 * with no signal, and what became of them. Kept in IndexedDB (so a reload, a dropped connection or a
 * closed tab loses nothing) and sent when the connection returns. Signing always needs the server.
 */
export const useDeviceQueueStore = defineStore('device-queue', () => {
  const stored = import.meta.client
    // The IndexedDB key keeps its first name: a device updated with work still queued finds it there.
    ? useIDBKeyval<DeviceQueue>(DEVICE_QUEUE_KEY, plain(EMPTY), {
        serializer: { read: raw => ({ ...plain(EMPTY), ...(raw as DeviceQueue) }), write: plain },
      })
    : { data: ref(plain(EMPTY)), isFinished: shallowRef(true) }
  const state = stored.data
  const loaded = stored.isFinished
  const online = toRef(useConnectionStore(), 'online')
  const syncing = ref(false)
  const lastError = ref<string | null>(null)
  const { user } = useUserSession()

  function draftFor(worksheetId: number | string, step: StepName): Record<string, unknown> | undefined {
    return state.value.values[worksheetId]?.[step]
  }
  function remember(worksheetId: number | string, step: StepName, values: Record<string, unknown>) {
    state.value.values[worksheetId] = { ...state.value.values[worksheetId], [step]: plain(toRaw(values)) }
  }
  function forget(worksheetId: number | string) {
    state.value.values = without(state.value.values, worksheetId)
    state.value.settle = without(state.value.settle, worksheetId)
    state.value.pending = state.value.pending.filter(entry => entry.worksheetId !== worksheetId)
  }
  const pendingFor = (worksheetId: number | string) =>
    state.value.pending.filter(entry => entry.worksheetId === worksheetId)
  /** The user's own steps waiting (a shared tablet sends each technician's only under their session). */
  const ownPending = computed(() => state.value.pending.filter(entry => entry.userId === user.value?.id))
  /** The user's own worksheets started on this device (a shared tablet keeps each technician's apart). */
  const localWorksheets = computed(() =>
    Object.values(state.value.local).filter(local => local.performer.id === user.value?.id),
  )
  /** The user's own photos kept here, waiting to be sent (or refused, with why). */
  const ownPhotos = computed(() => state.value.photos.filter(photo => photo.userId === user.value?.id))
  /** Everything of the user's still to be sent: steps, worksheets, photos. */
  const leftToSend = computed(() => ownPending.value.length
    + localWorksheets.value.filter(local => !local.failure).length
    + ownPhotos.value.filter(photo => !photo.failure).length)
  const waiting = computed(() => ({
    steps: ownPending.value.length,
    worksheets: localWorksheets.value.filter(local => !local.failure).length,
  }))

  /** A worksheet on this device as the step forms see it. */
  function localView(clientId: string): WorksheetView | null {
    const local = state.value.local[clientId]
    if (!local) return null
    return {
      id: local.clientId,
      state: 'draft',
      version: 0,
      round: 1,
      workOrder: local.workOrder,
      reason: local.reason,
      performer: local.performer,
      correctsId: local.correctsId ?? null,
      correctedBy: [],
      content: local.content,
      results: local.results,
      engineVersion: '',
      serviceable: null,
      returnReason: null,
      voidReason: null,
      performedAt: local.startedAt,
      submittedAt: null,
      releasedAt: null,
      createdAt: local.startedAt,
      updatedAt: local.steps.at(-1)?.at ?? local.startedAt,
      signatures: [],
      attachments: [],
      settleUntil: settleUntil(local.content),
    }
  }

  /** Starts a worksheet on this device, freezing the unit and the specification the device holds. */
  function startLocal(unit: InstalledUnitDto, specification: SpecificationDto, body: WorksheetCreateBody): string {
    if (!user.value || !unit.aircraft)
      throw new Error('A worksheet needs a signed-in technician and an installed unit.')
    const clientId = crypto.randomUUID()
    state.value.local[clientId] = {
      clientId,
      performer: { id: user.value.id, name: user.value.name },
      accumulatorId: unit.id,
      specificationId: specification.id,
      workOrder: body.workOrder,
      reason: body.reason,
      ...(body.correctsId ? { correctsId: body.correctsId } : {}),
      startedAt: new Date().toISOString(),
      steps: [],
      content: freezeWorksheetContent(unit, unit.aircraft, specification),
      results: {},
    }
    return clientId
  }

  /**
   * Runs a step on a worksheet kept here, by the same rules the server runs, with the device's clock and tool
   * register.
   */
  async function saveLocalStep(
    clientId: string,
    body: WorksheetStepBody,
    reference: FieldReference | null,
  ): Promise<WorksheetView> {
    // The rules (and the engine they run) load with the first step taken here, not with every page.
    const { applyStep, StepRefusal } = await import('#shared/utils/worksheet-steps')
    const local = state.value.local[clientId]
    if (!local) throw new Error('That worksheet is no longer on this device.')
    const now = new Date().toISOString()
    const tools = new Map((reference?.tools ?? []).map(tool => [tool.id, tool]))
    const today = stationDate(reference?.timeZone ?? 'UTC', now)
    try {
      const next = applyStep({ content: plain(local.content), results: plain(local.results) }, body, {
        now,
        today,
        tool: id => tools.get(id),
      })
      local.content = next.content
      local.results = next.results
      local.steps.push({ at: now, body: plain(body) })
      askToSendLater()
    }
    catch (error) {
      if (error instanceof StepRefusal) throw asApiFailure(error)
      throw error
    }
    return localView(clientId)!
  }

  /**
   * Saves one step. A worksheet kept here is worked on here; a server worksheet is saved to the
   * server, or — with no connection — queued with the device's time and `{ queued: true }` answered.
   */
  async function saveStep(
    worksheetId: number | string,
    body: WorksheetStepBody,
  ): Promise<{ worksheet?: WorksheetView, queued: boolean }> {
    if (typeof worksheetId === 'string')
      return { worksheet: await saveLocalStep(worksheetId, body, useFieldReferenceStore().reference), queued: false }
    try {
      const worksheet = await $fetch<WorksheetDto>(`/api/worksheets/${worksheetId}`, { method: 'PATCH', body })
      return { worksheet, queued: false }
    }
    catch (failure) {
      if (!noAnswer(failure)) throw failure
      state.value.pending = [
        ...state.value.pending.filter(entry => !(entry.worksheetId === worksheetId && entry.body.step === body.step)),
        { worksheetId, userId: user.value?.id ?? 0, body: plain(body), queuedAt: new Date().toISOString() },
      ]
      askToSendLater()
      return { queued: true }
    }
  }

  /**
   * Sends what waits (shared/utils/device-send.ts): steps of server worksheets with the time each was taken,
   * whole worksheets, then photos. Under a Web Lock, so the page and the service worker never send at once;
   * if the service worker sent while this page held an older copy, the copy IndexedDB holds is taken first.
   */
  async function flush(): Promise<SentWorksheet[]> {
    const userId = user.value?.id
    if (syncing.value || !online.value || !userId || !leftToSend.value) return []
    syncing.value = true
    lastError.value = null
    try {
      return await withSendLock(async () => {
        const held = await get<DeviceQueue>(DEVICE_QUEUE_KEY)
        const workerSent = held && (held.workerRevision ?? 0) !== (state.value.workerRevision ?? 0)
        if (workerSent) state.value = { ...plain(EMPTY), ...held }
        const queue = plain(state.value)
        // The sender loads when there is something to send, not with every page.
        const { sendDeviceQueue } = await import('#shared/utils/device-send')
        return sendDeviceQueue(queue, userId, {
          json: (path, init) => $fetch(path, { ...init, method: init.method as 'PATCH' | 'POST', body: init.body as Record<string, unknown> }),
          form: (path, form) => $fetch(path, { method: 'POST', body: form }),
          photo: key => get<Blob>(key).then(blob => blob ?? null),
          dropPhoto: key => del(key),
          save: (changed) => {
            state.value = plain(changed)
          },
        })
      })
    }
    catch (failure) {
      lastError.value = errorMessage(failure)
      return []
    }
    finally {
      syncing.value = false
    }
  }

  /**
   * Keeps a gauge photo on this device, to be sent with the queue (a worksheet started here, or no signal). The
   * service worker is asked to send the queue when the connection returns, app open or not.
   */
  async function keepPhoto(worksheet: number | string, file: File, replacesId?: number): Promise<QueuedPhoto> {
    const id = crypto.randomUUID()
    const blobKey = `chargewell:photo:${id}`
    await set(blobKey, file)
    const photo: QueuedPhoto = {
      id,
      worksheet,
      userId: user.value?.id ?? 0,
      name: file.name,
      type: file.type,
      takenAt: new Date().toISOString(),
      blobKey,
      ...(replacesId ? { replacesId } : {}),
    }
    state.value.photos = [...state.value.photos, photo]
    askToSendLater()
    return photo
  }
  const photosFor = (worksheet: number | string) => state.value.photos.filter(photo => photo.worksheet === worksheet)
  /** A kept photo's file (for its thumbnail), or null. */
  const photoFile = (photo: QueuedPhoto) => get<Blob>(photo.blobKey).then(blob => blob ?? null)
  async function dropPhoto(photo: QueuedPhoto) {
    state.value.photos = state.value.photos.filter(candidate => candidate.id !== photo.id)
    await del(photo.blobKey)
  }

  /** Drops a worksheet kept here (once sent, or the technician's decision after a refusal they have read). */
  function discardLocal(clientId: string) {
    state.value.local = without(state.value.local, clientId)
    forget(clientId)
  }

  /** The user's own refused steps, newest first. */
  const ownRefused = computed(() => state.value.refused.filter(entry => entry.userId === user.value?.id).reverse())
  /** The technician has read why a step was refused: it leaves the device. */
  function acknowledgeRefused(entry: RefusedStep) {
    state.value.refused = state.value.refused.filter(
      candidate => !(candidate.refusedAt === entry.refusedAt && candidate.worksheetId === entry.worksheetId
        && candidate.body.step === entry.body.step),
    )
  }

  function settleReadings(worksheetId: number | string) {
    return state.value.settle[worksheetId] ?? []
  }
  function addSettleReading(worksheetId: number | string, pressure: Pressure) {
    state.value.settle[worksheetId] = [
      ...settleReadings(worksheetId),
      { at: new Date().toISOString(), pressure: plain(pressure) },
    ]
  }
  function clearSettleReadings(worksheetId: number | string) {
    state.value.settle = without(state.value.settle, worksheetId)
  }

  if (import.meta.client) {
    // The service worker asks an open page to send (it sends itself only when no page is open).
    navigator.serviceWorker?.addEventListener('message', async (event) => {
      if (event.data?.type !== 'send-queue') return
      if (loaded.value) await flush()
      // Tells the service worker what is left, so a sync that sent nothing is tried again later.
      event.ports[0]?.postMessage({ left: loaded.value ? leftToSend.value : 1 })
    })
    watch(online, isOnline => isOnline && loaded.value && flush())
    watch(loaded, isLoaded => isLoaded && online.value && flush())
  }

  // The device's own work: never replaced by the (empty) state rendered on the server.
  return {
    state: skipHydrate(state),
    loaded: skipHydrate(loaded),
    online: skipHydrate(online),
    syncing,
    lastError,
    waiting,
    localWorksheets,
    ownPending,
    ownPhotos,
    leftToSend,
    ownRefused,
    acknowledgeRefused,
    draftFor,
    remember,
    forget,
    pendingFor,
    localView,
    startLocal,
    saveStep,
    flush,
    keepPhoto,
    photosFor,
    photoFile,
    dropPhoto,
    discardLocal,
    settleReadings,
    addSettleReading,
    clearSettleReadings,
  }
})
