import type {
  ChargeTargetResult,
  CorrectionCurveInput,
  CorrectionCurveResult,
  ReadingAssessment,
  TableTargetResult,
} from '#shared/gas'
import type { Pressure } from '#shared/gas/types'
import type { SpecificationTargetRequest } from '#shared/utils/specification-target'

export interface ChargeTargetRequest {
  target: SpecificationTargetRequest
  /** Curves to plot (real and ideal), for the gas-law method. */
  curves?: { real: CorrectionCurveInput, ideal: CorrectionCurveInput }
  asFound?: Pressure
}

interface Answer {
  key: string
  request: ChargeTargetRequest
  target: ChargeTargetResult | TableTargetResult
  curves: { real: CorrectionCurveResult, ideal: CorrectionCurveResult } | null
  assessment: ReadingAssessment | null
}

/**
 * Asks the calculation API for the target, the plotted curves and the verdict whenever the
 * request changes (debounced). A safety rule: an answer is shown only while the inputs are still
 * the ones it was computed for. Invalid inputs, a refused calculation, or inputs changed since
 * give no figure at all — never the last good one under new inputs.
 */
export function useChargeTarget(request: Ref<ChargeTargetRequest | null>) {
  const answer = shallowRef<Answer | null>(null)
  const failure = shallowRef<{ key: string, message: string, field: string | null } | null>(null)
  const key = computed(() => (request.value ? JSON.stringify(request.value) : null))
  const asking = ref<string | null>(null)

  async function compute(current: ChargeTargetRequest, mine: string) {
    asking.value = mine
    try {
      const result = await $fetch<ChargeTargetResult | TableTargetResult>(`/api/calc/${current.target.route}`, {
        method: 'POST',
        body: current.target.body,
      })
      const [real, ideal, verdict] = await Promise.all([
        current.curves
          ? $fetch<CorrectionCurveResult>('/api/calc/correction-curve', { method: 'POST', body: current.curves.real })
          : undefined,
        current.curves
          ? $fetch<CorrectionCurveResult>('/api/calc/correction-curve', { method: 'POST', body: current.curves.ideal })
          : undefined,
        current.asFound && result.low && result.high
          ? $fetch<ReadingAssessment>('/api/calc/assess-reading', {
              method: 'POST',
              body: {
                reading: current.asFound,
                target: result.target,
                low: result.low,
                high: result.high,
                ambient: current.target.body.ambient,
              },
            })
          : undefined,
      ])
      answer.value = {
        key: mine,
        request: current,
        target: result,
        curves: real && ideal ? { real, ideal } : null,
        assessment: verdict ?? null,
      }
      failure.value = null
    }
    catch (error) {
      const field = (error as { data?: { data?: { field?: string } } })?.data?.data?.field ?? null
      failure.value = { key: mine, message: errorMessage(error), field }
    }
    finally {
      if (asking.value === mine) asking.value = null
    }
  }

  watchDebounced(
    key,
    (current) => {
      if (current && request.value) void compute(request.value, current)
    },
    { debounce: 200, immediate: true },
  )

  // Only what belongs to the inputs as they are now.
  const fresh = computed(() => (answer.value && answer.value.key === key.value ? answer.value : null))
  return {
    target: computed(() => fresh.value?.target ?? null),
    curves: computed(() => fresh.value?.curves ?? null),
    assessment: computed(() => fresh.value?.assessment ?? null),
    /** The request the shown figures answer (for the plotted dots). */
    answered: computed(() => fresh.value?.request ?? null),
    pending: computed(() => key.value !== null && !fresh.value && failure.value?.key !== key.value),
    error: computed(() => (failure.value && failure.value.key === key.value ? failure.value.message : null)),
    /** The API field the refusal names (e.g. gasTemperature), to show it under that input. */
    errorField: computed(() => (failure.value && failure.value.key === key.value ? failure.value.field : null)),
  }
}
