import type { CycleCheckBody } from '#shared/schemas/cycle-check'
import type { CycleCheckDto, CycleTrendPage, FleetTrendRow, UnitTrendDto } from '#shared/types/trends'

export interface PrechargeTrendFilters {
  type?: string
  base?: string
  position: string
  partNumber: string
  flagged?: 'true'
}

/** Pre-charge loss by unit, one page at a time, for the filters given; a new filter starts from the first page. */
export function usePrechargeTrends(filters: PrechargeTrendFilters) {
  const page = ref(1)
  watch(filters, () => (page.value = 1))
  const query = computed(() => ({
    ...Object.fromEntries(Object.entries(filters).filter(([, value]) => value)),
    page: page.value,
  }))
  const list = useFetch<{ items: FleetTrendRow[], total: number, page: number, pageSize: number }>(
    '/api/trends/precharge',
    { key: 'trends-precharge', query },
  )
  return Object.assign(list, { page })
}

/**
 * Pump-cycle intervals by system, one page at a time. The chart is drawn in the browser only: its series (most
 * of the page's data, 100 KB) stay out of the server-rendered page (`seriesLeftOut`) and are fetched once the
 * page is live. Rendering them into the page's payload held up the server's event loop for 40–50 ms a page.
 */
export function useCycleTrends() {
  const page = ref(1)
  const list = useFetch<CycleTrendPage & { seriesLeftOut?: true }>('/api/trends/cycles', {
    key: 'trends-cycles',
    query: { page },
    transform: answer => import.meta.server
      ? { ...answer, items: answer.items.map(item => ({ ...item, series: [] })), seriesLeftOut: true as const }
      : answer,
  })
  // After hydration: a refresh asked for while the page hydrates is answered from the payload.
  onNuxtReady(() => {
    if (list.data.value?.seriesLeftOut) list.refresh()
  })
  return Object.assign(list, { page })
}

/** One unit's pre-charge history with its fitted loss rate. */
export function useUnitTrend(id: number) {
  return useFetch<UnitTrendDto>(`/api/trends/precharge/${id}`, { key: `unit-trend-${id}` })
}

/** The latest pump cycle checks, newest first. */
export function useRecentCycleChecks(pageSize = 20) {
  return useFetch<{ total: number, items: CycleCheckDto[] }>('/api/cycle-checks', {
    key: 'cycle-checks-recent',
    query: { pageSize },
  })
}

/**
 * Records a pump cycle check, or corrects `check` on the version the user saw (a check changed since is refused
 * with 409). The server computes the implied leak rate it answers with.
 */
export function saveCycleCheck(body: CycleCheckBody, check?: Pick<CycleCheckDto, 'id' | 'version'> | null) {
  return check
    ? $fetch<CycleCheckDto>(`/api/cycle-checks/${check.id}`, {
        method: 'PATCH',
        body,
        headers: { 'if-match': `"${check.version}"` },
      })
    : $fetch<CycleCheckDto>('/api/cycle-checks', { method: 'POST', body })
}

/** Withdraws a check with a reason: it stays on record and no longer counts in the trend. */
export function withdrawCycleCheck(check: Pick<CycleCheckDto, 'id' | 'version'>, reason: string) {
  return $fetch<CycleCheckDto>(`/api/cycle-checks/${check.id}/withdraw`, {
    method: 'POST',
    body: { reason },
    headers: { 'if-match': `"${check.version}"` },
  })
}
