import type { AircraftBody } from '#shared/schemas/aircraft'
import type { AccumulatorMoveBody } from '#shared/schemas/accumulators'
import type { AircraftDto, FleetOptions, InstalledUnitDto, UnitDetailDto } from '#shared/types/fleet'
import { useFieldReferenceStore } from '~~/stores/field-reference'

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

/**
 * The installed units a page offers, wherever they come from: the server's list, or — with no answer (no
 * signal on the ramp) — the station's units as this device holds them, with the time that copy was taken.
 * A connection that drops after the list came does not swap it (and lose what was picked). `installed` is
 * the request itself, to await where the page renders on the server.
 */
export function useStationUnits() {
  const installed = useInstalledUnits()
  const device = useFieldReferenceStore()
  const fromDevice = computed(() => !installed.data.value?.length && !!device.reference)
  const units = computed<InstalledUnitDto[] | undefined>(() =>
    fromDevice.value ? device.reference!.units : (installed.data.value ?? undefined))
  /** When the device's copy was taken, while the units shown are that copy. */
  const asOf = computed(() => fromDevice.value ? device.reference!.fetchedAt : null)
  const error = computed(() => units.value?.length ? null : installed.error.value)
  /** The current specification for a part number: the server's, or the one the device holds. */
  const specificationFor = (partNumber: string | undefined) =>
    device.reference?.specifications.find(candidate => candidate.partNumber === partNumber)
  return { installed, status: installed.status, units, fromDevice, asOf, error, specificationFor }
}

/** Installed units the register finds for a search beyond the page's list (a picker's typed text). */
export async function findInstalledUnits(query: Record<string, string | number>) {
  const answer = await $fetch<{ items: InstalledUnitDto[] }>('/api/accumulators', {
    query: { installed: 'true', pageSize: 100, ...query },
  })
  return answer.items
}

/** The aircraft types and bases the fleet holds, for filter menus (shared by every page that filters by them). */
export function useFleetOptions() {
  return useFetch<FleetOptions>('/api/aircraft/options', { key: 'fleet-options', default: () => ({ types: [], bases: [] }) })
}

/** The fleet register's two lists, filtered, sorted and paged on the server. */
export function useAircraftRegister(filters: Record<string, unknown>) {
  return useRegisterList<AircraftDto>('/api/aircraft', 'aircraft-register', filters, 'registration')
}
export function useUnitRegister(filters: Record<string, unknown>) {
  return useRegisterList<InstalledUnitDto>('/api/accumulators', 'unit-register', filters, 'partNumber')
}

/** Every aircraft by registration, for a move's destination. */
export function useAircraftChoices() {
  return useFetch('/api/aircraft', {
    key: 'aircraft-all',
    query: { pageSize: 500 },
    transform: (answer: { items: { id: number, registration: string }[] }) => answer.items,
  })
}

/** Adds an aircraft to the fleet. */
export function addAircraft(body: AircraftBody) {
  return $fetch<AircraftDto>('/api/aircraft', { method: 'POST', body })
}

/**
 * One unit with its history; a move (or removal to stores) is read back from the server. With no signal
 * (a label scanned on the ramp), `onDevice` is the unit as the device's station copy holds it, if it does.
 */
export async function useUnit(id: number) {
  const device = useFieldReferenceStore()
  const unit = await useFetch<UnitDetailDto>(`/api/accumulators/${id}`, { key: `unit-${id}` })
  async function move(body: AccumulatorMoveBody) {
    await $fetch(`/api/accumulators/${id}`, { method: 'PATCH', body: { move: body } })
    await unit.refresh()
  }
  const onDevice = computed(() => unit.error.value && isNoAnswer(unit.error.value)
    ? device.reference?.units.find(candidate => candidate.id === id) ?? null
    : null)
  const onDeviceAsOf = computed(() => onDevice.value ? device.reference!.fetchedAt : null)
  return { ...unit, move, onDevice, onDeviceAsOf }
}

/**
 * A unit's label code (SVG), as an image address; refused with the server's reason when the address it
 * would open is one only the server's own machine can reach.
 */
export function useUnitLabel(id: number) {
  return useFetch(`/api/accumulators/${id}/label`, {
    key: `unit-label-${id}`,
    responseType: 'text',
    server: false,
    transform: (svg: string) => `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`,
  })
}
