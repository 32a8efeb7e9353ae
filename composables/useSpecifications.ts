import type { SpecificationBody } from '#shared/schemas/specifications'
import type { SpecificationDto } from '#shared/types/registers'

/** The current revision of every specification, for pickers. */
export function useCurrentSpecifications() {
  return useFetch('/api/specifications', {
    key: 'specifications-current',
    query: { status: 'current', pageSize: 500 },
    transform: (answer: { items: SpecificationDto[] }) => answer.items,
  })
}

/** The specification register, filtered, sorted and paged on the server. */
export function useSpecificationRegister(filters: Record<string, unknown>) {
  return useRegisterList<SpecificationDto>('/api/specifications', 'specification-register', filters, 'partNumber')
}

/** One revision of a specification. */
export function useSpecification(id: number) {
  return useFetch<SpecificationDto>(`/api/specifications/${id}`, { key: `specification-${id}` })
}

/** Every revision of a part number, newest first (only that part number: the search also matches its prefixes). */
export function useSpecificationRevisions(id: number, partNumber: () => string | undefined) {
  return useFetch('/api/specifications', {
    key: `specification-revisions-${id}`,
    query: computed(() => ({ status: 'all', q: partNumber(), pageSize: 50, sort: 'revision', direction: 'desc' })),
    transform: (answer: { items: SpecificationDto[] }) => answer.items.filter(item => item.partNumber === partNumber()),
  })
}

/** A new specification (its first revision). */
export function addSpecification(body: SpecificationBody) {
  return $fetch<SpecificationDto>('/api/specifications', { method: 'POST', body })
}

/** A new revision of the specification `id` (the one revised stays on record, superseded). */
export function reviseSpecification(id: number, body: SpecificationBody) {
  return $fetch<SpecificationDto>(`/api/specifications/${id}`, { method: 'PATCH', body })
}
