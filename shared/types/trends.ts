import type { PrechargeFit } from '../gas/leakage'
import type { Pressure, Temperature } from '../gas/types'
import type { UnitTrendFlag } from '../utils/trend-flags'

/** One unit's pre-charge trend (`GET /api/trends/precharge/:accumulatorId`). */
export interface UnitTrendDto {
  accumulator: { id: number, partNumber: string, serialNumber: string, position: string | null }
  aircraft: { id: number, registration: string, type: string, base: string } | null
  specification: {
    id: number
    partNumber: string
    revision: string
    pressureUnit: string
    pressureBasis: string
  } | null
  /** The fit and its points, carried to `reference`. */
  trend: (PrechargeFit & { reference: { pressure: Pressure, temperature: Temperature } }) | null
  flag: UnitTrendFlag
  /** Each released service: as-found and as-left carried to the reference temperature. */
  services: {
    worksheetId: number
    performedAt: string
    asFound: number | null
    asLeft: number | null
    action: string
  }[]
}

/** One row of the fleet ranking (`GET /api/trends/precharge`). */
export interface FleetTrendRow {
  accumulatorId: number
  registration: string | null
  type: string | null
  base: string | null
  position: string | null
  partNumber: string
  serialNumber: string
  unit: string | null
  /** Pressure units per day, positive when losing gas. */
  lossRate: number | null
  lossRateStandardError: number | null
  predictedOutOfLimitsAt: string | null
  nextCheckAt: string | null
  flagged: boolean
  reasons: string[]
  services: number
}

/** One pump cycle check as the API answers it (`/api/cycle-checks`). */
export interface CycleCheckDto {
  id: number
  /** Row version: send it back as If-Match with a correction or withdrawal. */
  version: number
  aircraftId: number
  registration: string | null
  system: string
  accumulatorId: number
  checkedAt: string
  intervalSeconds: number
  inputs: import('../schemas/cycle-check').CycleCheckBody
  results: {
    fluidReleased: { value: number, unit: string }
    leakRate: { value: number, unit: string }
    warnings: string[]
    method: string
  }
  engineVersion: string
  recordedById: number
  withdrawnAt: string | null
  withdrawnReason: string | null
}

/** What the engine found for a cycle check, as stored with it. */
export interface CycleCheckResults {
  fluidReleased: { value: number, unit: string }
  leakRate: { value: number, unit: string }
  warnings: string[]
  method: string
}

/** One hydraulic system's pump-cycle trend as the Trends table shows it (from the stored trend). */
export interface CycleTrendRow {
  aircraftId: number
  registration: string
  system: string
  accumulatorId: number
  checks: number
  baselineSeconds: number | null
  latestSeconds: number | null
  latestLeakRate: { value: number, unit: string } | null
  /** Share by which the latest interval is below the baseline (0.3 = 30 % shorter). */
  drop: number | null
  flagged: boolean
  message: string | null
  lastCheckedAt: string | null
  /** The intervals over time for a chart: at most 60 points (baseline and latest kept). */
  series: { checkedAt: string, intervalSeconds: number }[]
}

/** A page of the systems' trends, and the flagged ones (bounded), as GET /api/trends/cycles answers. */
export interface CycleTrendPage {
  items: CycleTrendRow[]
  total: number
  page: number
  pageSize: number
  flagged: CycleTrendRow[]
  flaggedTotal: number
  dropShare: number
}
