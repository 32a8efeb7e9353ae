import type { Calculated } from '#shared/utils/calculation'
import type { ChargeTargetAnswer, ChargeTargetRequest } from '#shared/utils/charge-target-answer'

type Answerer = (request: ChargeTargetRequest) => Calculated<ChargeTargetAnswer>

/**
 * The target, the plotted curves and the as-found verdict, computed on this device by the shared engine from the
 * inputs on screen (shared/utils/charge-target-answer.ts): instant, and the same with no signal (the server
 * recomputes whatever it stores). The safety rule holds by construction: a figure is always the one for the
 * inputs as they are now, and invalid inputs or a refused calculation give no figure at all — never the last
 * good one under new inputs.
 */
export function useChargeTarget(request: Ref<ChargeTargetRequest | null>) {
  // The engine's checks and curves load with the first request, not with the page (its JavaScript budget); the
  // service worker keeps them for use with no signal.
  const answerer = shallowRef<Answerer | null>(null)
  watch(request, (asked) => {
    if (asked && !answerer.value && import.meta.client)
      void import('#shared/utils/charge-target-answer').then(module => (answerer.value = module.chargeTargetAnswer))
  }, { immediate: true })
  const answer = computed(() => (request.value && answerer.value ? answerer.value(request.value) : null))
  const fresh = computed(() => answer.value?.result ?? null)
  const refusal = computed(() => answer.value?.refusal ?? null)
  return {
    target: computed(() => fresh.value?.target ?? null),
    curves: computed(() => fresh.value?.curves ?? null),
    assessment: computed(() => fresh.value?.assessment ?? null),
    /** The request the shown figures answer (for the plotted dots). */
    answered: computed(() => fresh.value?.request ?? null),
    error: computed(() => refusal.value?.message ?? null),
    /** The field the refusal names (e.g. gasTemperature), to show it under that input. */
    errorField: computed(() => refusal.value?.field ?? null),
  }
}
