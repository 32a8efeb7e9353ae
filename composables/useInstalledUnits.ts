import type { InstalledUnitDto } from '#shared/types/fleet'

/** The most installed units a page loads at once; the picker asks the register for the rest. */
export const INSTALLED_UNITS_PAGE = 500

/** The installed accumulators, for the pickers (aircraft, then position): the first page of a large fleet. */
export function useInstalledUnits() {
  return useFetch('/api/accumulators', {
    key: 'installed-units',
    query: { installed: 'true', pageSize: INSTALLED_UNITS_PAGE },
    transform: (answer: { items: InstalledUnitDto[] }) => answer.items,
  })
}
