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
}
