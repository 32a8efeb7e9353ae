import type { InstalledUnitDto } from '#shared/types/fleet'

/** Every installed accumulator, for the pickers (aircraft, then position). */
export function useInstalledUnits() {
  return useFetch('/api/accumulators', {
    key: 'installed-units',
    query: { installed: 'true', pageSize: 500 },
    transform: (answer: { items: InstalledUnitDto[] }) => answer.items,
  })
}
