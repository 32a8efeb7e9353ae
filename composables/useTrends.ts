import type { CycleTrendPage, FleetTrendRow } from '#shared/types/trends'

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
