import type { SpecificationDto } from '#shared/types/registers'

/** The current revision of every specification, for pickers. */
export function useCurrentSpecifications() {
  return useFetch('/api/specifications', {
    key: 'specifications-current',
    query: { status: 'current', pageSize: 500 },
    transform: (answer: { items: SpecificationDto[] }) => answer.items,
  })
}
