/** Quantities at the engine's edges, exactly as the calculation API carries them. */

export const PRESSURE_UNITS = ['psi', 'bar', 'kPa', 'MPa'] as const
export const PRESSURE_BASES = ['gauge', 'absolute'] as const
export const TEMPERATURE_UNITS = ['C', 'F', 'K', 'R'] as const
export const VOLUME_UNITS = ['in3', 'L', 'cm3', 'm3'] as const
export const ELEVATION_UNITS = ['m', 'ft'] as const
export const INTERVAL_UNITS = ['s', 'min', 'h'] as const

export type PressureUnit = (typeof PRESSURE_UNITS)[number]
export type PressureBasis = (typeof PRESSURE_BASES)[number]
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number]
export type VolumeUnit = (typeof VOLUME_UNITS)[number]
export type ElevationUnit = (typeof ELEVATION_UNITS)[number]
export type IntervalUnit = (typeof INTERVAL_UNITS)[number]

export interface Pressure { value: number, unit: PressureUnit, basis: PressureBasis }
export interface Temperature { value: number, unit: TemperatureUnit }
export interface Volume { value: number, unit: VolumeUnit }
export interface Elevation { value: number, unit: ElevationUnit }
export interface Interval { value: number, unit: IntervalUnit }

/** Local atmosphere: a barometric reading (absolute) or a field elevation. */
export type Ambient = { pressure: Pressure } | { elevation: Elevation }

/** How the gas changes state: isothermal, adiabatic (isentropic) or polytropic p·Vⁿ = const. */
export type Process = 'isothermal' | 'adiabatic' | { n: number }

/** `real`: nitrogen by Span et al. (2000); `ideal`: p·V = m·R·T. */
export type GasModel = 'ideal' | 'real'

/** A tolerance band as the approved data states it at the reference temperature. */
export interface Tolerance { minus: number, plus: number, unit: PressureUnit | '%' }

/** One point of an approved-data table: the pre-charge to hold at a gas temperature. */
export interface TablePoint { temperature: Temperature, pressure: Pressure }

/** What every engine result carries, so a stored record can show how its numbers were found. */
export interface Provenance<I> {
  inputs: I
  method: string
  engineVersion: string
}
