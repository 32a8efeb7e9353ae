import type { StudyDto, StudyListItem } from '#shared/types/study'

/** Saved sizing studies matching a search, one page at a time; a new search starts from the first page. */
export async function useStudyList(search: Ref<string>, pageSize = 20) {
  const page = ref(1)
  watch(search, () => (page.value = 1))
  const query = computed(() => ({ q: search.value || undefined, page: page.value, pageSize }))
  const list = await useFetch<{ total: number, items: StudyListItem[] }>('/api/studies', { key: 'studies', query })
  return { ...list, page, pageSize }
}

/** One saved study as stored (its inputs; the figures are computed from them on the page). */
export function useSavedStudy(id: number) {
  return useFetch<StudyDto>(`/api/studies/${id}`, { key: `study-${id}` })
}
