import { z, type ZodRawShape } from 'zod'
import './plain-words'
import {
  ambientSchema,
  gasModelSchema,
  intervalSchema,
  numberField,
  pressureBasisSchema,
  pressureSchema,
  pressureUnitSchema,
  processSchema,
  temperatureSchema,
  toleranceSchema,
  volumeSchema,
} from './quantities'
import { VOLUME_UNITS, type VolumeUnit } from '../gas/types'

/**
 * Bodies of the calculation API (see the team's CALC-API contract), shared by pages and routes.
 * Unknown fields are refused: a misspelt optional field (say `ambiant`) would otherwise be
 * dropped without a word and the answer computed without it.
 */
function calculationBody<Shape extends ZodRawShape>(shape: Shape) {
  return z.object(shape).strict()
}

export const chargeTargetSchema = calculationBody({
  reference: z.object(
    { pressure: pressureSchema, temperature: temperatureSchema },
    { required_error: 'Enter the reference pre-charge and temperature.' },
  ),
  gasTemperature: temperatureSchema,
  ambient: ambientSchema.optional(),
  model: gasModelSchema.optional(),
  tolerance: toleranceSchema.optional(),
})
export type ChargeTargetBody = z.infer<typeof chargeTargetSchema>

export const tableTargetSchema = calculationBody({
  points: z
    .array(z.object({ temperature: temperatureSchema, pressure: pressureSchema }))
    .min(2, 'A table needs at least two points.'),
  gasTemperature: temperatureSchema,
  ambient: ambientSchema.optional(),
  tolerance: toleranceSchema.optional(),
})

export const correctionCurveSchema = calculationBody({
  reference: z.object({ pressure: pressureSchema, temperature: temperatureSchema }),
  tolerance: toleranceSchema.optional(),
  ambient: ambientSchema.optional(),
  model: gasModelSchema.optional(),
  from: temperatureSchema,
  to: temperatureSchema,
  points: z.number().int('Whole number of points.').min(2).max(2000).optional(),
})

const sizingConditions = {
  precharge: pressureSchema,
  prechargeTemperature: temperatureSchema,
  operatingTemperature: temperatureSchema.optional(),
  maxPressure: pressureSchema,
  minPressure: pressureSchema,
  charge: processSchema.optional(),
  discharge: processSchema.optional(),
  perApplication: volumeSchema.optional(),
  ambient: ambientSchema.optional(),
  model: gasModelSchema.optional(),
}

export const usableVolumeSchema = calculationBody({ gasVolume: volumeSchema, ...sizingConditions })
export type UsableVolumeBody = z.infer<typeof usableVolumeSchema>

export const requiredVolumeSchema = calculationBody({
  ...sizingConditions,
  usable: volumeSchema.optional(),
  applications: z
    .number({ invalid_type_error: 'Must be a whole number.' })
    .int('Must be a whole number.')
    .positive('At least one application.')
    .max(10000)
    .optional(),
}).superRefine((body, context) => {
  if (body.usable) return
  if (body.applications === undefined) {
    context.addIssue({
      code: 'custom',
      path: ['usable'],
      message: 'Give a usable volume, or a number of applications with a volume per application.',
    })
  }
  else if (!body.perApplication) {
    context.addIssue({ code: 'custom', path: ['perApplication'], message: 'Give the volume per application.' })
  }
})

export const optimumPrechargeSchema = calculationBody({
  ...sizingConditions,
  precharge: z.undefined({ invalid_type_error: 'This route finds the pre-charge: leave `precharge` out (give `prechargeUnit` for the unit of the answer).' }).optional(),
  prechargeUnit: z.object({ unit: pressureUnitSchema, basis: pressureBasisSchema }).strict().optional(),
  gasVolume: volumeSchema,
})

export const envelopeSchema = calculationBody({
  gasVolume: volumeSchema,
  ...sizingConditions,
  operatingTemperature: z.undefined({ invalid_type_error: 'Give the temperatures in `temperatures`.' }).optional(),
  temperatures: z
    .array(z.object({ label: z.string().max(40).optional(), temperature: temperatureSchema }))
    .min(1, 'Give at least one temperature.')
    .max(12, 'At most 12 temperatures.'),
})

const FLOW_RATE_UNITS = VOLUME_UNITS.flatMap(unit => (['s', 'min', 'h'] as const).map(per => `${unit}/${per}` as const)) as unknown as
  readonly [`${VolumeUnit}/${'s' | 'min' | 'h'}`, ...`${VolumeUnit}/${'s' | 'min' | 'h'}`[]]

const cycleConditions = {
  gasVolume: volumeSchema,
  precharge: pressureSchema,
  prechargeTemperature: temperatureSchema,
  temperature: temperatureSchema,
  cutOut: pressureSchema,
  cutIn: pressureSchema,
  ambient: ambientSchema.optional(),
  model: gasModelSchema.optional(),
}

export const leakRateSchema = calculationBody({ ...cycleConditions, interval: intervalSchema })
export type LeakRateBody = z.infer<typeof leakRateSchema>

export const leakIntervalSchema = calculationBody({
  ...cycleConditions,
  // As leak-rate answers it ({ value, unit: "in3/min" }), or per second or hour.
  leakRate: z.object({
    value: numberField('a leak rate').positive('The leak rate must be above zero.'),
    unit: z.enum(FLOW_RATE_UNITS, { errorMap: () => ({ message: `Leak rate unit must be a volume per time, one of: ${FLOW_RATE_UNITS.join(', ')} (leak-rate answers per minute).` }) }),
  }).strict(),
  intervalUnit: z.enum(['s', 'min', 'h']).optional(),
})

export const assessReadingSchema = calculationBody({
  reading: pressureSchema,
  target: pressureSchema,
  low: pressureSchema,
  high: pressureSchema,
  gaugeAccuracy: z.object({ value: numberField('an accuracy').nonnegative(), unit: pressureUnitSchema }).optional(),
  ambient: ambientSchema.optional(),
})

/** Readings while the gas settles after a charge or vent, for the settled-pressure forecast. */
export const settleForecastSchema = calculationBody({
  readings: z.array(z.object({
    minutesAfter: numberField('the minutes after the charge or vent').min(0, 'Minutes after the action cannot be negative.').max(1440),
    pressure: pressureSchema,
  }).strict(), { required_error: 'Give the readings taken while the gas settles.' }).min(2, 'Two readings at least.').max(60),
  timeConstantMinutes: numberField('a time constant in minutes').positive().max(1440).optional(),
  readingUncertainty: numberField('the reading uncertainty').nonnegative().optional(),
  resolution: numberField('the gauge resolution').positive('A resolution is above zero.').optional(),
  band: z.object({ low: pressureSchema, high: pressureSchema }).strict().optional(),
})
export type SettleForecastBody = z.infer<typeof settleForecastSchema>
