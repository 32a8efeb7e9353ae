import { useConnectionStore } from '~~/stores/connection'
import { useFieldReferenceStore } from '~~/stores/field-reference'

/**
 * Whether this device holds what work with no signal needs: the app itself (its service worker in control,
 * so pages open with no network) and, for whoever services units, their station's copy — units,
 * specifications, tools — with the time it was taken. The header shows it on every page
 * (`data-ready`), so a mechanic sees it before walking out, and the tests wait on it.
 */
export function useOfflineReadiness() {
  const reference = useFieldReferenceStore()
  const connection = useConnectionStore()
  const needsStationCopy = useAbility('worksheet.perform')
  const appHeld = ref(false)
  if (import.meta.client && 'serviceWorker' in navigator) {
    const update = () => {
      appHeld.value = !!navigator.serviceWorker.controller
    }
    onMounted(() => {
      update()
      navigator.serviceWorker.addEventListener('controllerchange', update)
    })
    onBeforeUnmount(() => navigator.serviceWorker.removeEventListener('controllerchange', update))
  }
  const asOf = computed(() => (reference.kept ? reference.reference?.fetchedAt ?? null : null))
  const ready = computed(() => appHeld.value && (!needsStationCopy.value || !!asOf.value))
  const words = computed(() => {
    if (!appHeld.value) return 'Not ready offline yet: the app is still being kept on this device.'
    if (!needsStationCopy.value) return 'Ready offline: the app and its calculators.'
    if (!asOf.value) {
      return connection.online
        ? 'Not ready offline yet: your station\'s data is being kept on this device.'
        : 'Not ready offline: this device holds no station data. Connect once to take it.'
    }
    const day = formatDate(asOf.value) === formatDate(new Date()) ? '' : ` on ${formatDate(asOf.value)}`
    return `Ready offline: station data as of ${formatTime(asOf.value)}${day}.`
  })
  return { ready, words, asOf, refreshing: toRef(reference, 'refreshing') }
}
