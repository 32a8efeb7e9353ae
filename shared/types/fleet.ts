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
export interface FleetOptions { types: string[], bases: string[] }
