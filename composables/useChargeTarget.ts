import type { ChargeTargetResult, CorrectionCurveInput, CorrectionCurveResult, ReadingAssessment, TableTargetResult } from '~~/shared/gas'
import type { Pressure } from '~~/shared/gas/types'
import type { SpecificationTargetRequest } from '~~/shared/utils/specification-target'

export interface ChargeTargetRequest {
  target: SpecificationTargetRequest
  /** Curves to plot (real and ideal), for the gas-law method. */
  curves?: { real: CorrectionCurveInput, ideal: CorrectionCurveInput }
  asFound?: Pressure
}

/**
 * Asks the calculation API for the target, the plotted curves and the verdict whenever the
 * request changes (debounced); an answer to an older request is dropped.
 */
export function useChargeTarget(request: Ref<ChargeTargetRequest | null>) {
  const target = ref<ChargeTargetResult | TableTargetResult | null>(null)
  const curves = ref<{ real: CorrectionCurveResult, ideal: CorrectionCurveResult } | null>(null)
  const assessment = ref<ReadingAssessment | null>(null)
  const pending = ref(false)
  const error = ref<string | null>(null)
  let sequence = 0
  let timer: ReturnType<typeof setTimeout> | undefined

  async function compute(current: ChargeTargetRequest, mine: number) {
    pending.value = true
    try {
      const result = await $fetch<ChargeTargetResult | TableTargetResult>(`/api/calc/${current.target.route}`, { method: 'POST', body: current.target.body })
      const [real, ideal, verdict] = await Promise.all([
        current.curves ? $fetch<CorrectionCurveResult>('/api/calc/correction-curve', { method: 'POST', body: current.curves.real }) : undefined,
        current.curves ? $fetch<CorrectionCurveResult>('/api/calc/correction-curve', { method: 'POST', body: current.curves.ideal }) : undefined,
        current.asFound && result.low && result.high
          ? $fetch<ReadingAssessment>('/api/calc/assess-reading', { method: 'POST', body: { reading: current.asFound, target: result.target, low: result.low, high: result.high, ambient: current.target.body.ambient } })
          : undefined,
      ])
      if (mine !== sequence) return
      target.value = result
      curves.value = real && ideal ? { real, ideal } : null
      assessment.value = verdict ?? null
      error.value = null
    }
    catch (failure) {
      if (mine !== sequence) return
      error.value = errorMessage(failure)
    }
    finally {
      if (mine === sequence) pending.value = false
    }
  }

  watch(request, (current) => {
    clearTimeout(timer)
    const mine = ++sequence
    if (!current) {
      target.value = null
      assessment.value = null
      pending.value = false
      return
    }
    timer = setTimeout(() => compute(current, mine), 200)
  }, { deep: true, immediate: true })

  onScopeDispose(() => clearTimeout(timer))
  return { target, curves, assessment, pending, error }
}
