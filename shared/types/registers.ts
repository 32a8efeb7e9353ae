import type { GasModel, PressureBasis, PressureUnit, TemperatureUnit, VolumeUnit } from '../gas/types'

export const ACCUMULATOR_TYPES = ['piston', 'bladder', 'diaphragm'] as const
export type AccumulatorType = (typeof ACCUMULATOR_TYPES)[number]

/**
 * `gas-law`: the engine carries the reference pre-charge to temperature; `table`: the approved data's points are
 * interpolated.
 */
export const CORRECTION_METHODS = ['gas-law', 'table'] as const
export type CorrectionMethod = (typeof CORRECTION_METHODS)[number]

export const SPECIFICATION_STATUSES = ['current', 'superseded'] as const
export type SpecificationStatus = (typeof SPECIFICATION_STATUSES)[number]

export const TOOL_KINDS = ['gauge', 'cart'] as const
export type ToolKind = (typeof TOOL_KINDS)[number]

/** A specification as pages and routes exchange it. Pressures in `pressureUnit` / `pressureBasis`. */
export interface SpecificationDto {
  id: number
  partNumber: string
  revision: string
  status: SpecificationStatus
  title: string
  accumulatorType: AccumulatorType
  gasVolume: number
  gasVolumeUnit: VolumeUnit
  pressureUnit: PressureUnit
  pressureBasis: PressureBasis
  referencePressure: number
  referenceTemperature: number
  referenceTemperatureUnit: TemperatureUnit
  toleranceMinus: number
  tolerancePlus: number
  toleranceUnit: PressureUnit | '%'
  correctionMethod: CorrectionMethod
  gasModel: GasModel
  maxPressure: number
  minPressure: number
  settleMinutes: number
  checkIntervalDays: number | null
  lossThresholdPerDay: number | null
  dataReference: string
  dataRevision: string
  tablePoints: { temperature: number, temperatureUnit: TemperatureUnit, pressure: number }[]
}

/** A gauge or nitrogen cart as the API answers it, with its calibration state at the station today. */
export interface ToolDto {
  id: number
  kind: ToolKind
  assetNumber: string
  description: string
  rangeMax: number | null
  rangeUnit: PressureUnit | null
  resolution: number | null
  accuracy: number | null
  accuracyUnit: PressureUnit | '%FS' | null
  calibrationDue: string | null
  active: boolean
  calibrationExpired: boolean
  calibrationMissing: boolean
}
