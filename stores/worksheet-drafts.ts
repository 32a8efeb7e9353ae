import { defineStore, skipHydrate } from 'pinia'
import type { WorksheetStepBody } from '#shared/schemas/worksheet'
import type { WorksheetDto } from '#shared/types/worksheet'

const STORAGE_KEY = 'chargewell:worksheet-drafts'

type StepName = WorksheetStepBody['step']

interface DraftState {
  /** What the user has typed into each step's form, saved or not, per worksheet. */
  values: Record<number, Partial<Record<StepName, Record<string, unknown>>>>
  /** Step saves that could not reach the server yet, oldest first. */
  pending: { worksheetId: number, body: WorksheetStepBody, queuedAt: string }[]
}

function load(): DraftState {
  if (!import.meta.client) return { values: {}, pending: [] }
  try {
    const stored = JSON.parse(localStorage.getItem(STORAGE_KEY) ?? '') as DraftState
    return { values: stored.values ?? {}, pending: stored.pending ?? [] }
  }
  catch {
    return { values: {}, pending: [] }
  }
}

function isOffline(failure: unknown): boolean {
  const status = (failure as { statusCode?: number, response?: unknown })?.statusCode
  return status === undefined || (import.meta.client && !navigator.onLine)
}

/**
 * The worksheet in progress, kept in the browser (localStorage) so that a reload, a dropped
 * connection or a closed tab loses nothing, and synced to the server when it can be reached.
 */
export const useWorksheetDraftsStore = defineStore('worksheet-drafts', () => {
  const state = ref<DraftState>(load())
  const syncing = ref(false)
  const lastError = ref<string | null>(null)

  if (import.meta.client) {
    watch(state, current => localStorage.setItem(STORAGE_KEY, JSON.stringify(current)), { deep: true })
    window.addEventListener('online', () => void flush())
  }

  function draftFor(worksheetId: number, step: StepName): Record<string, unknown> | undefined {
    return state.value.values[worksheetId]?.[step]
  }

  function remember(worksheetId: number, step: StepName, values: Record<string, unknown>) {
    state.value.values[worksheetId] = { ...state.value.values[worksheetId], [step]: structuredClone(toRaw(values)) }
  }

  function forget(worksheetId: number) {
    state.value.values = Object.fromEntries(
      Object.entries(state.value.values).filter(([key]) => Number(key) !== worksheetId),
    )
    state.value.pending = state.value.pending.filter(entry => entry.worksheetId !== worksheetId)
  }

  const pendingCount = computed(() => state.value.pending.length)
  const pendingFor = (worksheetId: number) => state.value.pending.filter(entry => entry.worksheetId === worksheetId)

  /**
   * Saves one step. Offline, the save is queued and `{ queued: true }` returned; an answer
   * from the server (a refusal with field issues) is thrown for the form to show.
   */
  async function saveStep(
    worksheetId: number,
    body: WorksheetStepBody,
  ): Promise<{ worksheet?: WorksheetDto, queued: boolean }> {
    try {
      const worksheet = await $fetch<WorksheetDto>(`/api/worksheets/${worksheetId}`, { method: 'PATCH', body })
      return { worksheet, queued: false }
    }
    catch (failure) {
      if (!isOffline(failure)) throw failure
      state.value.pending = [
        ...state.value.pending.filter(entry => !(entry.worksheetId === worksheetId && entry.body.step === body.step)),
        { worksheetId, body, queuedAt: new Date().toISOString() },
      ]
      return { queued: true }
    }
  }

  /** Sends the queued saves in order; stops at the first that still cannot be sent. */
  async function flush(): Promise<void> {
    if (syncing.value || state.value.pending.length === 0) return
    syncing.value = true
    lastError.value = null
    try {
      while (state.value.pending.length) {
        const [next] = state.value.pending
        try {
          await $fetch(`/api/worksheets/${next!.worksheetId}`, { method: 'PATCH', body: next!.body })
        }
        catch (failure) {
          if (isOffline(failure)) return
          lastError.value = `A step saved on this device was refused by the server: ${errorMessage(failure)}`
        }
        state.value.pending = state.value.pending.slice(1)
      }
    }
    finally {
      syncing.value = false
    }
  }

  // The drafts belong to this device: never replaced by the (empty) state rendered on the server.
  return {
    state: skipHydrate(state),
    syncing,
    lastError,
    pendingCount,
    pendingFor,
    draftFor,
    remember,
    forget,
    saveStep,
    flush,
  }
})
