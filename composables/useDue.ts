import type { DueListDto } from '#shared/types/due'

/** The due list, for the chosen station (or every station). */
export function useDueList(station: Ref<string | undefined>) {
  return useFetch<DueListDto>('/api/due', { query: computed(() => (station.value ? { station: station.value } : {})), key: 'due-list' })
}
