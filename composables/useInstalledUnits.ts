import type { InstalledUnitDto } from '#shared/types/fleet'

/** The most installed units a page loads at once; the picker asks the register for the rest. */
export const INSTALLED_UNITS_PAGE = 500

/**
 * The installed accumulators, for the pickers (aircraft, then position): the first page of a large fleet.
 * `server: false` where they only fill a filter or a form below the fold: fetched by the browser after
 * the page shows, so the server neither waits for them nor writes hundreds of units into the page.
 */
export function useInstalledUnits(options: { server?: boolean } = {}) {
  const server = options.server ?? true
  return useFetch('/api/accumulators', {
    key: 'installed-units',
    server,
    lazy: !server,
    query: { installed: 'true', pageSize: INSTALLED_UNITS_PAGE },
    transform: (answer: { items: InstalledUnitDto[] }) => answer.items,
  })
}
