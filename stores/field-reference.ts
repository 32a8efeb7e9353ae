import { useIDBKeyval } from '@vueuse/integrations/useIDBKeyval'
import { set } from 'idb-keyval'
import { defineStore, skipHydrate } from 'pinia'
import { can } from '#shared/abilities'
import type { FieldReference } from '#shared/types/field'
import {
  applyReferenceUpdate, digestQuery, referenceDigests, type FieldReferenceUpdate,
} from '#shared/utils/field-reference-delta'
import { useConnectionStore } from './connection'

const plain = <T>(value: T): T => JSON.parse(JSON.stringify(value))
/** How often the station copy is refreshed while the app is open and connected. */
const REFRESH_EVERY_MS = 10 * 60_000
const STORE_KEY = 'chargewell:field-reference'

/**
 * What a technician's device keeps to work with no signal — their station's aircraft and units,
 * the current specifications, the tools with their calibration dates — in IndexedDB, refreshed
 * whenever the connection is there. Kept per user: a shared tablet never offers one technician's
 * station to another. Once it holds a copy, a refresh brings only what changed.
 */
export const useFieldReferenceStore = defineStore('field-reference', () => {
  const stored = import.meta.client
    ? useIDBKeyval<{ userId: number, reference: FieldReference } | null>(STORE_KEY, null, {
        serializer: { read: raw => raw as never, write: plain },
      })
    : { data: ref(null), isFinished: shallowRef(true) }
  const { user } = useUserSession()
  const online = toRef(useConnectionStore(), 'online')
  const refreshing = ref(false)
  /** The copy shown is the one IndexedDB holds (read from it, or written through to it). */
  const kept = ref(false)
  const error = ref<string | null>(null)
  const reference = computed(() =>
    stored.data.value && stored.data.value.userId === user.value?.id ? stored.data.value.reference : null,
  )

  async function refresh(): Promise<void> {
    if (!online.value || refreshing.value || !can(user.value?.roles, 'worksheet.perform')) return
    refreshing.value = true
    error.value = null
    try {
      // Holding a copy, the device asks only for what changed since (compared by digests).
      const held = reference.value
      const fresh = held
        ? applyReferenceUpdate(held, await $fetch<FieldReferenceUpdate>('/api/field/reference', {
            query: digestQuery(referenceDigests(held)),
          }))
        : await $fetch<FieldReference>('/api/field/reference')
      stored.data.value = { userId: user.value!.id, reference: fresh }
      // Written through at once, so "ready offline" is said only of what a reload with no network finds.
      await set(STORE_KEY, plain(stored.data.value))
      kept.value = true
    }
    catch (failure) {
      error.value = errorMessage(failure)
    }
    finally {
      refreshing.value = false
    }
  }

  if (import.meta.client) {
    watch(stored.isFinished, (loaded) => {
      if (loaded && stored.data.value) kept.value = true
    }, { immediate: true })
    // Kept fresh in the background while the connection is there: only what changed comes down.
    setInterval(() => {
      if (document.visibilityState === 'visible') void refresh()
    }, REFRESH_EVERY_MS)
    watch(
      [online, () => user.value?.id, stored.isFinished],
      ([isOnline, id, loaded]) => {
        if (isOnline && id && loaded) refresh()
      },
      { immediate: true },
    )
  }
  return { reference: skipHydrate(reference), loaded: skipHydrate(stored.isFinished), kept, refreshing, error, refresh }
})
