import { z } from 'zod'
import './plain-words'
import { ACCUMULATOR_TYPES } from '../types/registers'
import {
  ambientSchema, gasModelSchema, pressureSchema, processSchema, temperatureSchema, volumeSchema,
} from './quantities'

export const studyInputSchema = z.object({
  name: z.string({ required_error: 'Name the study.' }).trim().min(3, 'Name the study in a few words.').max(160),
  specificationId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable().default(null),
  accumulatorType: z.enum(ACCUMULATOR_TYPES, { errorMap: () => ({ message: 'The type is piston, bladder or diaphragm.' }) }),
  gasVolume: volumeSchema,
  precharge: pressureSchema,
  prechargeTemperature: temperatureSchema,
  maxPressure: pressureSchema,
  minPressure: pressureSchema,
  perApplication: volumeSchema.optional(),
  charge: processSchema.default('isothermal'),
  discharge: processSchema.default('adiabatic'),
  model: gasModelSchema.default('real'),
  ambient: ambientSchema.optional(),
  envelope: z.array(z.object({ label: z.string().trim().min(1, 'Label each temperature.').max(40), temperature: temperatureSchema }))
    .min(1, 'Give at least one temperature.').max(6, 'At most six temperatures.'),
  inverse: z.object({
    applications: z.number().int('A whole number of applications.').positive().max(1000).optional(),
    usable: volumeSchema.optional(),
  }).strict().optional(),
}).strict()
export type StudyInput = z.infer<typeof studyInputSchema>

export const studyListQuerySchema = z.object({
  q: z.string().trim().max(80).optional(),
  specificationId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
})

/** One condition's temperature on the Sizing page: empty is refused, never taken as zero. */
export const conditionTemperatureSchema = z.number({
  required_error: 'Enter the temperature of this condition.',
  invalid_type_error: 'Enter the temperature of this condition as a number.',
})

/**
 * The Sizing page's form state: figures in the user's units, flat as the inputs hold them.
 * `toStudyInput` turns it into the body the API takes.
 */
export const studyFormSchema = z.object({
  name: z.string().trim().min(3, 'Name the study in a few words.').max(160),
  specificationId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable(),
  accumulatorType: z.enum(ACCUMULATOR_TYPES),
  pressureUnit: z.enum(['psi', 'bar', 'kPa', 'MPa']),
  basis: z.enum(['gauge', 'absolute']),
  temperatureUnit: z.enum(['C', 'F']),
  volumeUnit: z.enum(['in3', 'L']),
  gasVolume: z.number({ required_error: 'Enter the gas volume.', invalid_type_error: 'Enter the gas volume.' }).positive('The gas volume must be above zero.'),
  precharge: z.number({ required_error: 'Enter the pre-charge.', invalid_type_error: 'Enter the pre-charge.' }).positive('The pre-charge must be above zero.'),
  prechargeTemperature: z.number({ required_error: 'Enter the pre-charge temperature.', invalid_type_error: 'Enter the pre-charge temperature.' }),
  maxPressure: z.number({ required_error: 'Enter the maximum working pressure.', invalid_type_error: 'Enter the maximum working pressure.' }).positive(),
  minPressure: z.number({ required_error: 'Enter the minimum working pressure.', invalid_type_error: 'Enter the minimum working pressure.' }).positive(),
  perApplication: z.number({ required_error: 'Must be a number.', invalid_type_error: 'Must be a number.' }).positive('Must be above zero.').optional(),
  charge: z.enum(['isothermal', 'adiabatic', 'custom']),
  chargeExponent: z.number().min(1).max(2).optional(),
  discharge: z.enum(['isothermal', 'adiabatic', 'custom']),
  dischargeExponent: z.number().min(1).max(2).optional(),
  model: z.enum(['real', 'ideal']),
  elevation: z.number({ required_error: 'Enter the field elevation.', invalid_type_error: 'Enter the field elevation.' }),
  elevationUnit: z.enum(['m', 'ft']),
  envelope: z.array(z.object({ label: z.string().trim().min(1, 'Label it.').max(40), temperature: conditionTemperatureSchema })).min(1).max(6),
  inverseApplications: z.number().int().positive().max(1000).optional(),
})
export type StudyForm = z.infer<typeof studyFormSchema>

export function toStudyInput(form: StudyForm): StudyInput {
  const pressure = (value: number) => ({ value, unit: form.pressureUnit, basis: form.basis })
  const temperature = (value: number) => ({ value, unit: form.temperatureUnit })
  const process = (kind: StudyForm['charge'], n?: number) => kind === 'custom' ? { n: n ?? 1.2 } : kind
  return {
    name: form.name,
    specificationId: form.specificationId,
    accumulatorType: form.accumulatorType,
    gasVolume: { value: form.gasVolume, unit: form.volumeUnit },
    precharge: pressure(form.precharge),
    prechargeTemperature: temperature(form.prechargeTemperature),
    maxPressure: pressure(form.maxPressure),
    minPressure: pressure(form.minPressure),
    ...(form.perApplication ? { perApplication: { value: form.perApplication, unit: form.volumeUnit } } : {}),
    charge: process(form.charge, form.chargeExponent),
    discharge: process(form.discharge, form.dischargeExponent),
    model: form.model,
    ambient: { elevation: { value: form.elevation, unit: form.elevationUnit } },
    envelope: form.envelope.map(entry => ({ label: entry.label, temperature: temperature(entry.temperature) })),
    ...(form.inverseApplications && form.perApplication ? { inverse: { applications: form.inverseApplications } } : {}),
  }
}

/** The form state of a saved study (its stored input, in the units it was saved in). */
export function toStudyForm(input: StudyInput): StudyForm {
  const kind = (process: StudyInput['charge']) => typeof process === 'object' ? 'custom' as const : process
  const exponent = (process: StudyInput['charge']) => typeof process === 'object' ? process.n : undefined
  const elevation = input.ambient && 'elevation' in input.ambient ? input.ambient.elevation : { value: 0, unit: 'ft' as const }
  return {
    name: input.name,
    specificationId: input.specificationId,
    accumulatorType: input.accumulatorType,
    pressureUnit: input.precharge.unit,
    basis: input.precharge.basis,
    temperatureUnit: input.prechargeTemperature.unit === 'F' ? 'F' : 'C',
    volumeUnit: input.gasVolume.unit === 'L' ? 'L' : 'in3',
    gasVolume: input.gasVolume.value,
    precharge: input.precharge.value,
    prechargeTemperature: input.prechargeTemperature.value,
    maxPressure: input.maxPressure.value,
    minPressure: input.minPressure.value,
    perApplication: input.perApplication?.value,
    charge: kind(input.charge),
    chargeExponent: exponent(input.charge),
    discharge: kind(input.discharge),
    dischargeExponent: exponent(input.discharge),
    model: input.model,
    elevation: elevation.value,
    elevationUnit: elevation.unit,
    envelope: input.envelope.map(entry => ({ label: entry.label, temperature: entry.temperature.value })),
    inverseApplications: input.inverse?.applications,
  }
}
