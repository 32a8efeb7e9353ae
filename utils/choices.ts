import { PRESSURE_UNITS } from '#shared/gas/types'
import { ACCUMULATOR_TYPES } from '#shared/types/registers'

/**
 * The choices the unit and mode pickers offer (UiSegmented's `[value, label]` pairs), written once so that
 * Charge target, Sizing and the user menu offer the same units in the same words.
 */
export const PRESSURE_UNIT_CHOICES = PRESSURE_UNITS.map(unit => [unit, unit] as const)
export const PRESSURE_BASIS_CHOICES = [['gauge', 'Gauge'], ['absolute', 'Absolute']] as const
export const GAS_MODEL_CHOICES = [['real', 'Real gas'], ['ideal', 'Ideal gas']] as const
export const TEMPERATURE_UNIT_CHOICES = [['C', '°C'], ['F', '°F']] as const
export const VOLUME_UNIT_CHOICES = [['in3', 'in³'], ['L', 'L']] as const
export const ELEVATION_UNIT_CHOICES = [['ft', 'ft'], ['m', 'm']] as const
export const ACCUMULATOR_TYPE_CHOICES = ACCUMULATOR_TYPES.map(type => [type, type] as const)
