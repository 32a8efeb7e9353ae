import { z } from 'zod'
import './plain-words'
import { numberField, pressureBasisSchema, pressureUnitSchema } from './quantities'

/** An optional number as an input holds it: emptied ('' or NaN) means not given. */
function optionalNumber<T extends z.ZodTypeAny>(schema: T) {
  return z.preprocess(value => value === '' || value === null || (typeof value === 'number' && Number.isNaN(value)) ? undefined : value, schema.optional())
}

/**
 * The Charge target page's form state (flat, as the inputs hold it). The page turns a valid
 * state into a `chargeTargetSchema` / `tableTargetSchema` body for the calculation API.
 */
export const chargeTargetFormSchema = z.object({
  source: z.enum(['unit', 'specification', 'manual']),
  accumulatorId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  specificationId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  referencePressure: optionalNumber(numberField('the reference pre-charge').positive('The pre-charge must be above zero.')),
  referenceBasis: pressureBasisSchema,
  referenceTemperature: optionalNumber(numberField('the reference temperature')),
  toleranceMinus: optionalNumber(numberField('a tolerance').nonnegative('A tolerance cannot be negative.')),
  tolerancePlus: optionalNumber(numberField('a tolerance').nonnegative('A tolerance cannot be negative.')),
  toleranceUnit: z.enum(['unit', '%']),
  model: z.enum(['real', 'ideal']),
  gasTemperature: numberField('the gas temperature'),
  ambientMode: z.enum(['elevation', 'barometer']),
  elevation: numberField('the field elevation'),
  elevationUnit: z.enum(['m', 'ft']),
  stationPressureHpa: optionalNumber(numberField('the station pressure').min(300, 'Station pressure is at least 300 hPa.').max(1200, 'Station pressure is at most 1200 hPa.')),
  asFound: optionalNumber(numberField('the gauge reading')),
  pressureUnit: pressureUnitSchema,
}).superRefine((form, context) => {
  if (form.source === 'unit' && !form.accumulatorId) context.addIssue({ code: 'custom', path: ['accumulatorId'], message: 'Pick the installed accumulator.' })
  if (form.source === 'specification' && !form.specificationId) context.addIssue({ code: 'custom', path: ['specificationId'], message: 'Pick a specification.' })
  if (form.source === 'manual') {
    if (form.referencePressure === undefined) context.addIssue({ code: 'custom', path: ['referencePressure'], message: 'Enter the reference pre-charge.' })
    if (form.referenceTemperature === undefined) context.addIssue({ code: 'custom', path: ['referenceTemperature'], message: 'Enter the reference temperature.' })
  }
  if (form.ambientMode === 'barometer' && form.stationPressureHpa === undefined) context.addIssue({ code: 'custom', path: ['stationPressureHpa'], message: 'Enter the station pressure, or use the field elevation.' })
})
export type ChargeTargetForm = z.infer<typeof chargeTargetFormSchema>
