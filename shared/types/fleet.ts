/** An installed accumulator as the pickers list it. */
export interface InstalledUnitDto {
  id: number
  partNumber: string
  serialNumber: string
  position: string | null
  system: string | null
  installedAt: string | null
  aircraft: { id: number, registration: string, fleetNumber: string, type: string, base: string } | null
  specificationId: number | null
  /** Open trend alerts on the unit or its system, in words (a gas leak, shortening pump cycles). */
  alerts: string[]
}

/** The values the fleet's filters offer, read from the register. */
export interface FleetOptions {
  types: string[]
  bases: string[]
}

/** An aircraft as the fleet register lists it. */
export interface AircraftDto {
  id: number
  registration: string
  fleetNumber: string
  type: string
  base: string
  /** The operator's name. */
  operator: string
  active: boolean
}

/** One unit with where it has been and its latest worksheets (`GET /api/accumulators/:id`). */
export interface UnitDetailDto extends InstalledUnitDto {
  installations: {
    aircraft: string
    position: string
    installedAt: string
    removedAt: string | null
    removalReason: string | null
  }[]
  worksheets: {
    id: number
    state: import('./worksheet').WorksheetState
    workOrder: string
    performedAt: string | null
    asFoundVerdict: string | null
  }[]
}
