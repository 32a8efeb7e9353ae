import type { AuditVerifyAnswer } from '#shared/types/audit'
import type { OutboxDto } from '#shared/types/mail'
import type { AuditEventDto } from '#shared/utils/audit-words'

/** The audit trail in words, newest first, one kind of record at a time if wished; a new kind starts at page 1. */
export function useAuditEvents(entity: Ref<string | undefined>, pageSize = 25) {
  const page = ref(1)
  watch(entity, () => (page.value = 1))
  const query = computed(() => ({ page: page.value, pageSize, ...(entity.value ? { entity: entity.value } : {}) }))
  const events = useFetch<{ total: number, totalCapped?: boolean, items: AuditEventDto[] }>('/api/audit/events', {
    key: 'audit-events',
    query,
  })
  const pages = computed(() => Math.max(1, Math.ceil((events.data.value?.total ?? 0) / pageSize)))
  return { ...events, page, pages }
}

/** Walks the chain, its sealed head and every record's content; answers what no longer matches. */
export function verifyAuditTrail() {
  return $fetch<AuditVerifyAnswer>('/api/audit/verify')
}

/** Accepts a record's content as it stands (checked against the paper or a backup), with the reason kept. */
export function acceptRecordContent(entity: string, entityId: number, reason: string) {
  return $fetch('/api/audit/accept', { method: 'POST', body: { entity, entityId, reason } })
}

/** Seals the chain's head again over the entries there, with the reason kept. */
export function resealAuditHead(reason: string) {
  return $fetch('/api/audit/resolve-head', { method: 'POST', body: { reason } })
}

/** The mail outbox: each notification and what became of it; a retry is read back from the server. */
export async function useOutbox() {
  const outbox = await useFetch<OutboxDto>('/api/admin/outbox', { key: 'outbox' })
  async function retry(id: number) {
    await $fetch(`/api/admin/outbox/${id}/retry`, { method: 'POST' })
    await outbox.refresh()
  }
  return { ...outbox, retry }
}
