import { useIDBKeyval } from '@vueuse/integrations/useIDBKeyval'
import { defineStore, skipHydrate } from 'pinia'
import type { Pressure } from '#shared/gas/types'
import type { WorksheetCreateBody, WorksheetStepBody } from '#shared/schemas/worksheet'
import type { FieldReference, SyncAnswer } from '#shared/types/field'
import type { InstalledUnitDto } from '#shared/types/fleet'
import type { SpecificationDto } from '#shared/types/registers'
import type { WorksheetContent, WorksheetDto, WorksheetResults, WorksheetView } from '#shared/types/worksheet'
import { stationDate } from '#shared/utils/station-time'
import { applyStep, freezeWorksheetContent, settleUntil, StepRefusal } from '#shared/utils/worksheet-steps'
import { useConnectionStore } from './connection'
import { useFieldReferenceStore } from './field-reference'

type StepName = WorksheetStepBody['step']

/** A worksheet started on this device with no signal, kept here until the server has it. */
export interface LocalWorksheet {
  clientId: string
  performer: { id: number, name: string }
  accumulatorId: number
  specificationId: number
  workOrder: string
  reason: WorksheetCreateBody['reason']
  correctsId?: number
  startedAt: string
  /** Every step as taken, with the device's time: the server replays them in order. */
  steps: { at: string, body: WorksheetStepBody }[]
  content: WorksheetContent
  results: WorksheetResults
  /** The server refused the whole worksheet (the unit no longer installed …): why, for the technician. */
  failure?: string
}

/** A worksheet the server now holds, and what it could not accept as the device had it. */
export interface SentWorksheet {
  clientId: string
  worksheetId: number
  conflicts: string[]
  sentAt: string
  label: string
}

interface DeviceQueue {
  /** What the user has typed into each step's form, saved or not, per worksheet (id or client id). */
  values: Record<string, Partial<Record<StepName, Record<string, unknown>>>>
  /** Steps of server worksheets taken offline, oldest first, with the device's time. */
  pending: { worksheetId: number, userId: number, body: WorksheetStepBody, queuedAt: string }[]
  local: Record<string, LocalWorksheet>
  sent: SentWorksheet[]
  /** Readings taken while the gas settles, for the forecast (advice, kept on the device). */
  settle: Record<string, { at: string, pressure: Pressure }[]>
  /** Steps taken here that the server refused when sent: kept, with why, until the technician has seen them. */
  refused: RefusedStep[]
}

/** A step kept on the device that the server refused: what it was, when it was taken, and the server's reason. */
export interface RefusedStep {
  worksheetId: number
  userId: number
  body: WorksheetStepBody
  queuedAt: string
  refusedAt: string
  reason: string
}

/** The record without one key (a new object: the store is watched deeply). */
const without = <T>(record: Record<string, T>, key: string | number): Record<string, T> =>
  Object.fromEntries(Object.entries(record).filter(([candidate]) => candidate !== String(key)))

const EMPTY: DeviceQueue = { values: {}, pending: [], local: {}, sent: [], settle: {}, refused: [] }
const plain = <T>(value: T): T => JSON.parse(JSON.stringify(value))

/** No answer at all (the browser's own flag is not consulted: it says "online" on Wi-Fi with no internet). */
function isOffline(failure: unknown): boolean {
  return (failure as { statusCode?: number })?.statusCode === undefined
}

/** The server kept a refused step on the record as observed (a step this device took with no signal). */
function keptAsObservation(failure: unknown): boolean {
  return (failure as { data?: { data?: { keptAsObservation?: boolean } } })?.data?.data?.keptAsObservation === true
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
    ? useIDBKeyval<DeviceQueue>('chargewell:field-work', plain(EMPTY), {
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
  function saveLocalStep(clientId: string, body: WorksheetStepBody, reference: FieldReference | null): WorksheetView {
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
      return { worksheet: saveLocalStep(worksheetId, body, useFieldReferenceStore().reference), queued: false }
    try {
      const worksheet = await $fetch<WorksheetDto>(`/api/worksheets/${worksheetId}`, { method: 'PATCH', body })
      return { worksheet, queued: false }
    }
    catch (failure) {
      if (!isOffline(failure)) throw failure
      state.value.pending = [
        ...state.value.pending.filter(entry => !(entry.worksheetId === worksheetId && entry.body.step === body.step)),
        { worksheetId, userId: user.value?.id ?? 0, body: plain(body), queuedAt: new Date().toISOString() },
      ]
      return { queued: true }
    }
  }

  /** Sends what waits, in order: steps of server worksheets (with the time each was taken), then whole worksheets. */
  async function flush(): Promise<SentWorksheet[]> {
    if (syncing.value || !online.value) return []
    syncing.value = true
    lastError.value = null
    const sentNow: SentWorksheet[] = []
    try {
      while (ownPending.value.length) {
        const next = ownPending.value[0]!
        try {
          await $fetch(`/api/worksheets/${next.worksheetId}`, {
            method: 'PATCH',
            body: next.body,
            headers: { 'x-taken-at': next.queuedAt },
          })
        }
        catch (failure) {
          if (isOffline(failure)) return sentNow
          // Never dropped with a passing message: kept until the technician has read why.
          state.value.refused = [
            ...state.value.refused,
            {
              ...plain(next),
              refusedAt: new Date().toISOString(),
              reason: errorMessage(failure) + (keptAsObservation(failure)
                ? ' What you entered is kept on the worksheet as observed, with its time; redo the step.'
                : ''),
            },
          ]
        }
        state.value.pending = state.value.pending.filter(entry => entry !== next)
      }
      for (const local of localWorksheets.value.filter(candidate => !candidate.failure)) {
        try {
          const {
            clientId,
            performer: _performer,
            content: _content,
            results: _results,
            failure: _failure,
            ...body
          } = plain(local)
          const answer = await $fetch<SyncAnswer>('/api/worksheets/sync', {
            method: 'POST',
            body: { clientId, ...body },
          })
          const label = `${local.content.aircraft.registration} · ${local.content.accumulator.position} · ${local.workOrder}`
          const sent = {
            clientId,
            worksheetId: answer.worksheet.id,
            conflicts: answer.conflicts,
            sentAt: new Date().toISOString(),
            label,
          }
          state.value.sent = [sent, ...state.value.sent.filter(entry => entry.clientId !== clientId)].slice(0, 20)
          state.value.values[answer.worksheet.id] = state.value.values[clientId] ?? {}
          if (state.value.settle[clientId]) state.value.settle[answer.worksheet.id] = state.value.settle[clientId]!
          discardLocal(clientId)
          sentNow.push(sent)
        }
        catch (failure) {
          if (isOffline(failure)) return sentNow
          local.failure = errorMessage(failure)
        }
      }
    }
    finally {
      syncing.value = false
    }
    return sentNow
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
    discardLocal,
    settleReadings,
    addSettleReading,
    clearSettleReadings,
  }
})
