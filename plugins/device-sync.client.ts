import { useFieldReferenceStore } from '~~/stores/field-reference'
import { useDeviceQueueStore } from '~~/stores/device-queue'

/**
 * Work on the ramp: from the start, the device keeps its reference data fresh and sends what
 * waits whenever there is a connection (the stores watch the connection themselves). Pages are
 * rendered on the server, so the browser never asks for the session itself: ask once the service
 * worker is in control, so that it keeps the session for opening the app with no signal.
 */
export default defineNuxtPlugin(() => {
  const { loggedIn } = useUserSession()
  const keepSession = () => {
    if (loggedIn.value && navigator.serviceWorker?.controller) $fetch('/api/_auth/session').catch(() => {})
  }
  navigator.serviceWorker?.addEventListener('controllerchange', keepSession)
  watch(loggedIn, (signedIn) => {
    if (!signedIn) return
    keepSession()
    useFieldReferenceStore()
    useDeviceQueueStore()
  }, { immediate: true })
})
