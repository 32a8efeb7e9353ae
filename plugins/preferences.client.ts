import { usePreferencesStore } from '~~/stores/preferences'

/** Loads the signed-in user's units once the session is known (and after each sign-in). */
export default defineNuxtPlugin(() => {
  const { loggedIn } = useUserSession()
  const store = usePreferencesStore()
  watch(loggedIn, (signedIn) => {
    if (signedIn && !store.loaded) store.load().catch(() => { /* the menu shows defaults until the next try */ })
  }, { immediate: true })
})
