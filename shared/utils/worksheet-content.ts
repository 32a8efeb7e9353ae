import type { SpecificationDto } from '../types/registers'
import type { WorksheetContent } from '../types/worksheet'

/**
 * The small, engine-free parts of a worksheet's rules, for code that must not load the engine with them
 * (the device's queue, on every page): when the gas has settled, and the content a worksheet freezes.
 */

/** When the settle time after a charge or vent ends (null after no action). */
export function settleUntil(content: WorksheetContent): string | null {
  if (!content.action || content.action.kind === 'none') return null
  return new Date(Date.parse(content.action.recordedAt) + content.specification.settleMinutes * 60_000).toISOString()
}

/** The unit, its aircraft and the specification in force, as a worksheet freezes them (server and device alike). */
export function freezeWorksheetContent(
  accumulator: { id: number, partNumber: string, serialNumber: string, position: string | null },
  aircraft: { id: number, registration: string, fleetNumber: string, type: string },
  specification: SpecificationDto | Omit<SpecificationDto, 'status'>,
): WorksheetContent {
  const { status: _status, ...frozen } = specification as SpecificationDto
  return {
    specification: frozen,
    aircraft: {
      id: aircraft.id,
      registration: aircraft.registration,
      fleetNumber: aircraft.fleetNumber,
      type: aircraft.type,
    },
    accumulator: {
      id: accumulator.id,
      partNumber: accumulator.partNumber,
      serialNumber: accumulator.serialNumber,
      position: accumulator.position ?? '',
    },
  }
}
