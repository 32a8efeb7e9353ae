import type { StudyInput } from '#shared/schemas/study'
import type { StudyResults } from '#shared/utils/study'

/**
 * A sizing study's results for the inputs on screen, asked of the calculation API as they change (debounced).
 * The safety rule of every figure: results show only while the inputs are the ones they were computed for —
 * an old table under new or invalid inputs would read as theirs.
 */
export function useStudyResults(input: Ref<StudyInput | null>) {
  const answer = shallowRef<{ key: string, results: StudyResults } | null>(null)
  const failure = shallowRef<{ key: string, message: string } | null>(null)
  const key = computed(() => (input.value ? JSON.stringify(input.value) : null))
  watchDebounced(key, async (current) => {
    if (!current || !input.value) return
    const body = input.value
    try {
      answer.value = { key: current, results: await $fetch<StudyResults>('/api/calc/study', { method: 'POST', body }) }
      failure.value = null
    }
    catch (error) {
      failure.value = { key: current, message: errorMessage(error) }
    }
  }, { debounce: 300, immediate: true })
  return {
    results: computed(() => (answer.value && answer.value.key === key.value ? answer.value.results : null)),
    computeError: computed(() => (failure.value && failure.value.key === key.value ? failure.value.message : null)),
  }
}
