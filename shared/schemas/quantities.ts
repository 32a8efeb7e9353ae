import { z } from 'zod'
import './plain-words'
import { unitLabel } from '../gas/format'
import { convertTemperature } from '../gas/units'
import {
  ELEVATION_UNITS, INTERVAL_UNITS, PRESSURE_BASES, PRESSURE_UNITS, TEMPERATURE_UNITS, VOLUME_UNITS,
} from '../gas/types'

/** A finite number, with messages a mechanic can read. */
export function numberField(what = 'a number') {
  return z.number({ required_error: `Enter ${what}.`, invalid_type_error: `Must be ${what}.` }).finite(`Must be ${what}.`)
}

function oneOf<T extends readonly [string, ...string[]]>(values: T, what: string) {
  return z.enum(values, { errorMap: () => ({ message: `${what} must be one of: ${values.join(', ')}.` }) })
}

export const pressureUnitSchema = oneOf(PRESSURE_UNITS, 'Pressure unit')
export const pressureBasisSchema = oneOf(PRESSURE_BASES, 'Pressure basis')
export const temperatureUnitSchema = oneOf(TEMPERATURE_UNITS, 'Temperature unit')
export const volumeUnitSchema = oneOf(VOLUME_UNITS, 'Volume unit')

export const pressureSchema = z.object({
  value: numberField('a pressure'),
  unit: pressureUnitSchema,
  basis: pressureBasisSchema,
}, { required_error: 'Enter a pressure.', invalid_type_error: 'Enter a pressure as { value, unit, basis }.' })

export const temperatureSchema = z.object({
  value: numberField('a temperature'),
  unit: temperatureUnitSchema,
}, { required_error: 'Enter a temperature.', invalid_type_error: 'Enter a temperature as { value, unit }.' })

/**
 * Gas temperatures an accumulator is serviced at: −60 °C to +90 °C (common practice, no source:
 * beyond the cold-soak and hot-ramp temperatures a unit meets). Outside it is a slip or the wrong
 * unit; the message gives the limits in the unit the value was entered in.
 */
export const GAS_TEMPERATURE_RANGE_C = { min: -60, max: 90 }

export const gasTemperatureSchema = temperatureSchema.superRefine((temperature, context) => {
  const celsius = convertTemperature(temperature, 'C').value
  if (celsius >= GAS_TEMPERATURE_RANGE_C.min && celsius <= GAS_TEMPERATURE_RANGE_C.max) return
  const limit = (value: number) => Math.round(convertTemperature({ value, unit: 'C' }, temperature.unit).value)
  context.addIssue({
    code: 'custom', path: ['value'],
    message: `A gas temperature is between ${limit(GAS_TEMPERATURE_RANGE_C.min)} and ${limit(GAS_TEMPERATURE_RANGE_C.max)} ${unitLabel(temperature.unit)}; check the reading and the unit.`,
  })
})

export const volumeSchema = z.object({
  value: numberField('a volume').positive('A volume must be above zero.'),
  unit: volumeUnitSchema,
}, { required_error: 'Enter a volume.', invalid_type_error: 'Enter a volume as { value, unit }.' })

export const elevationSchema = z.object({
  value: numberField('an elevation'),
  unit: oneOf(ELEVATION_UNITS, 'Elevation unit'),
})

export const intervalSchema = z.object({
  value: numberField('a time').positive('The interval must be above zero.'),
  unit: oneOf(INTERVAL_UNITS, 'Time unit'),
}, { required_error: 'Enter the interval.' })

export const ambientSchema = z.union([
  z.object({ pressure: pressureSchema.refine(pressure => pressure.basis === 'absolute', 'A barometric reading is an absolute pressure.') }).strict(),
  z.object({ elevation: elevationSchema }).strict(),
], { errorMap: () => ({ message: 'Give the ambient as { pressure } (absolute) or { elevation }.' }) })

export const processSchema = z.union([
  z.literal('isothermal'),
  z.literal('adiabatic'),
  z.object({ n: numberField('an exponent').min(1, 'A polytropic exponent is at least 1.').max(2, 'A polytropic exponent is at most 2.') }).strict(),
], { errorMap: () => ({ message: 'Use "isothermal", "adiabatic" or { "n": exponent from 1 to 2 }.' }) })

export const gasModelSchema = z.enum(['ideal', 'real'], { errorMap: () => ({ message: 'The model must be "ideal" or "real".' }) })

export const toleranceSchema = z.object({
  minus: numberField('a tolerance').nonnegative('A tolerance cannot be negative.'),
  plus: numberField('a tolerance').nonnegative('A tolerance cannot be negative.'),
  unit: z.enum([...PRESSURE_UNITS, '%'], { errorMap: () => ({ message: `Tolerance unit must be one of: ${[...PRESSURE_UNITS, '%'].join(', ')}.` }) }),
})
