import { defineStore } from 'pinia'
import { DEFAULT_PREFERENCES, type PublicUser, type UserPreferences } from '#shared/types/user'

/** The signed-in user's units and home station: loaded from the server, saved back to it. */
export const usePreferencesStore = defineStore('preferences', () => {
  const preferences = ref<UserPreferences>({ ...DEFAULT_PREFERENCES })
  const loaded = ref(false)
  const saving = ref(false)
  const error = ref<string | null>(null)

  async function load() {
    const me = await $fetch<PublicUser>('/api/me')
    preferences.value = { ...DEFAULT_PREFERENCES, ...me.preferences }
    loaded.value = true
  }

  async function save(next: UserPreferences) {
    saving.value = true
    error.value = null
    const previous = preferences.value
    preferences.value = next
    try {
      const me = await $fetch<PublicUser>('/api/me/preferences', { method: 'PATCH', body: next })
      preferences.value = me.preferences
    }
    catch (failure) {
      preferences.value = previous
      error.value = errorMessage(failure)
      throw failure
    }
    finally {
      saving.value = false
    }
  }

  function reset() {
    preferences.value = { ...DEFAULT_PREFERENCES }
    loaded.value = false
  }

  return { preferences, loaded, saving, error, load, save, reset }
})
