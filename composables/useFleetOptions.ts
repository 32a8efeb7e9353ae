import type { FleetOptions } from '#shared/types/fleet'

/** The aircraft types and bases the fleet holds, for filter menus (shared by every page that filters by them). */
export function useFleetOptions() {
  return useFetch<FleetOptions>('/api/aircraft/options', { key: 'fleet-options', default: () => ({ types: [], bases: [] }) })
}
