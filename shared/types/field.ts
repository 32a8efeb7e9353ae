import type { InstalledUnitDto } from './fleet'
import type { SpecificationDto, ToolDto } from './registers'
import type { WorksheetDto } from './worksheet'

/** What a technician's device keeps to work with no signal (`GET /api/field/reference`). */
export interface FieldReference {
  /** The station whose aircraft are included (the user's home station), or null for the whole fleet. */
  station: string | null
  units: InstalledUnitDto[]
  /** The current specification of every part number among the units. */
  specifications: SpecificationDto[]
  /** Gauges and carts in service, with their calibration dates (the device checks them by date). */
  tools: ToolDto[]
  /** The station's time zone, for "today" on the device. */
  timeZone: string
  fetchedAt: string
}

/** The answer to a worksheet sent from a device (`POST /api/worksheets/sync`). */
export interface SyncAnswer {
  worksheet: WorksheetDto
  /** What the server could not accept as the device had it, in words; empty when all went through. */
  conflicts: string[]
  /** False when the worksheet had been sent before (the same answer again). */
  created: boolean
}
