import { studyInputSchema, type StudyInput } from '#shared/schemas/study'
import { calculate } from '#shared/utils/calculation'
import { computeStudy, type StudyResults } from '#shared/utils/study'

/**
 * A sizing study's results for the inputs on screen, computed on this device by the shared engine (the same with
 * no signal; the server recomputes what it saves). Computed once typing pauses: a study takes tens of
 * milliseconds, too long for every keystroke. The safety rule of every figure: results show only while the
 * inputs are the ones they were computed for — an old table under new or invalid inputs would read as theirs.
 */
export function useStudyResults(input: Ref<StudyInput | null>) {
  const answer = shallowRef<{ key: string, results: StudyResults } | null>(null)
  const failure = shallowRef<{ key: string, message: string } | null>(null)
  const key = computed(() => (input.value ? JSON.stringify(input.value) : null))
  watchDebounced(key, (current) => {
    if (!current || !input.value) return
    const study = calculate(studyInputSchema, input.value, computeStudy, 'precharge')
    answer.value = study.result ? { key: current, results: study.result } : null
    failure.value = study.refusal ? { key: current, message: study.refusal.message } : null
  }, { debounce: 150, immediate: true })
  return {
    results: computed(() => (answer.value && answer.value.key === key.value ? answer.value.results : null)),
    computeError: computed(() => (failure.value && failure.value.key === key.value ? failure.value.message : null)),
  }
}
