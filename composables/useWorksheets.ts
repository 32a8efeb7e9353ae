import type { SortingState } from '@tanstack/vue-table'
import type { WorksheetCreateBody } from '#shared/schemas/worksheet'
import type { WaitingWork } from '#shared/types/work'
import type {
  WorksheetDto,
  WorksheetListItem,
  WorksheetListPage,
  WorksheetState,
  WorksheetView,
} from '#shared/types/worksheet'

/** A decision on a whole worksheet, taken on the version the user saw. */
export type WorksheetDecision = 'sign' | 'countersign' | 'return' | 'void' | 'discard'

/**
 * One worksheet as the server holds it; its page, print view and steps share the one key. `reload` reads it
 * again (no answer leaves it as shown) but never goes back: a read answered after a step's save (a slow
 * connection, a busy server) carries an older version, and showing it would undo that step on screen.
 */
export async function useWorksheet(id: number) {
  const record = await useFetch<WorksheetDto>(`/api/worksheets/${id}`, { key: `worksheet-${id}` })
  async function reload() {
    // No answer (no signal): the record on screen stays as it is.
    const fresh = await $fetch<WorksheetDto>(`/api/worksheets/${id}`).catch(() => null)
    if (fresh && (!record.data.value || fresh.version >= record.data.value.version)) record.data.value = fresh
  }
  return { ...record, reload }
}

/**
 * Signs, countersigns, returns, voids or discards a worksheet. Sent with the version on screen (`if-match`):
 * if someone changed the record since, the server refuses with 409 (`isConflict`) rather than act on a
 * record the user has not seen.
 */
export function decideWorksheet(
  worksheet: Pick<WorksheetDto, 'id' | 'version'>,
  decision: WorksheetDecision,
  body: { reason?: string, password?: string, certify?: boolean, passkey?: unknown },
) {
  return $fetch<WorksheetDto>(`/api/worksheets/${worksheet.id}/${decision}`, {
    method: 'POST',
    body,
    headers: { 'if-match': `"${worksheet.version}"` },
  })
}

/** Opens a worksheet on the server (a correction names the worksheet it corrects in the body). */
export function startWorksheet(body: WorksheetCreateBody) {
  return $fetch<WorksheetDto>('/api/worksheets', { method: 'POST', body })
}

/** Attaches a gauge photo (or replaces one) and answers the worksheet as it now is. */
export async function attachGaugePhoto(worksheetId: number | string, file: File, replacesId?: number) {
  const form = new FormData()
  form.append('worksheetId', String(worksheetId))
  form.append('kind', 'gauge-photo')
  if (replacesId) form.append('replacesId', String(replacesId))
  // The name as a field of its own: a multipart header cannot carry every name (";" and "=" break it).
  form.append('fileName', file.name)
  form.append('file', file)
  await $fetch('/api/attachments', { method: 'POST', body: form })
  return $fetch<WorksheetView>(`/api/worksheets/${worksheetId}`)
}

/** Removes a photo; answers the worksheet without it. */
export function removeAttachment(id: number) {
  return $fetch<WorksheetView>(`/api/attachments/${id}`, { method: 'DELETE' })
}

export interface WorksheetFilters {
  aircraftId?: number
  accumulatorId?: number
  state?: WorksheetState
  from?: string
  to?: string
  q?: string
  performerId?: number
}

/**
 * The worksheet register: filters, sorting and a cursor kept in the address bar (a filtered list can be
 * bookmarked or shared), one page at a time. The server hands out where the next and previous pages start;
 * a changed filter or sort starts from the first.
 */
export async function useWorksheetList(filters: WorksheetFilters, pageSize = 25) {
  const route = useRoute()
  const router = useRouter()
  const sorting = ref<SortingState>([{ id: 'createdAt', desc: true }])
  const cursor = ref<string | undefined>((route.query.cursor as string | undefined) ?? undefined)
  const pageNumber = ref(1)
  const filterQuery = computed(() => ({
    ...Object.fromEntries(Object.entries(filters).filter(([, value]) => value !== undefined && value !== '')),
    sort: sorting.value[0]?.id ?? 'createdAt',
    direction: sorting.value[0]?.desc === false ? 'asc' : 'desc',
  }))
  const query = computed(() => ({ ...filterQuery.value, ...(cursor.value ? { cursor: cursor.value } : {}), pageSize }))
  watch(query, current => router.replace({ query: { ...current, pageSize: undefined } as never }), { deep: true })
  watch(filterQuery, () => {
    cursor.value = undefined
    pageNumber.value = 1
  }, { deep: true })
  const exportHref = computed(() => `/api/worksheets/export?${new URLSearchParams(
    Object.entries(filterQuery.value).map(([key, value]) => [key, String(value)]),
  ).toString()}`)

  const list = await useFetch<WorksheetListPage>('/api/worksheets', { key: 'worksheets', query })
  function turn(to: 'next' | 'previous') {
    const target = list.data.value?.[to]
    if (!target) return
    cursor.value = target
    pageNumber.value += to === 'next' ? 1 : -1
  }
  return { ...list, sorting, pageNumber, pageSize, turn, exportHref }
}

/** The worksheets one tool was used on, newest first: traceability when a gauge is found out of calibration. */
export function useWorksheetsWithTool(toolId: number) {
  return useFetch<WorksheetListPage>('/api/worksheets', {
    key: `tool-${toolId}-worksheets`,
    query: { toolId, pageSize: 50 },
  })
}

/** Worksheets awaiting countersign, oldest first (the queue an inspector works through). */
export function useCountersignQueue() {
  return useFetch<{ total: number, items: WorksheetListItem[] }>('/api/worksheets', {
    key: 'countersign-queue',
    query: { state: 'awaiting-countersign', sort: 'createdAt', direction: 'asc', pageSize: 200 },
  })
}

/** What waits for the signed-in user: returned work, work to countersign, drafts, work with an inspector. */
export function useWaitingWork() {
  return useFetch<WaitingWork>('/api/me/work', { key: 'home-work' })
}
