import type { SortingState } from '@tanstack/vue-table'

/** A register page's list: filters, sorting and page number sent to the server as the query. */
export function useRegisterList<Row>(
  endpoint: string,
  key: string,
  filters: Record<string, unknown>,
  defaultSort: string,
  pageSize = 25,
) {
  const page = ref(1)
  const sorting = ref<SortingState>([{ id: defaultSort, desc: false }])
  const query = computed(() => ({
    ...Object.fromEntries(
      Object.entries(filters).filter(([, value]) => value !== undefined && value !== '' && value !== null),
    ),
    sort: sorting.value[0]?.id ?? defaultSort,
    direction: sorting.value[0]?.desc ? 'desc' : 'asc',
    page: page.value,
    pageSize,
  }))
  watch(
    () => ({ ...filters }),
    () => {
      page.value = 1
    },
    { deep: true },
  )
  const list = useFetch<{ total: number, totalCapped?: boolean, items: Row[] }>(endpoint, { key, query })
  return { ...list, page, sorting, pageSize }
}

/** A register page's list as `RegisterTable` shows it. */
export type RegisterList<Row> = ReturnType<typeof useRegisterList<Row>>

/** What an import did, or (a preview) would do: each row added, updated (cell by cell) or unchanged; the problems. */
export interface ImportReport {
  imported: number
  added: number
  updated: number
  unchanged: number
  preview: boolean
  changes: {
    line: number
    key: string
    action: 'added' | 'updated' | 'unchanged'
    changes?: Record<string, { from: unknown, to: unknown }>
  }[]
  rejected: { line: number, field: string, message: string }[]
}

/**
 * A register's CSV import: every line is checked before any is kept (the refusal lists the lines and fields).
 * `preview`: nothing is written; the answer says what the import would change.
 */
export function importRegisterCsv(endpoint: string, file: File, preview = false) {
  const form = new FormData()
  form.append('file', file)
  return $fetch<ImportReport>(endpoint, { method: 'POST', body: form, query: preview ? { preview: 'true' } : undefined })
}
