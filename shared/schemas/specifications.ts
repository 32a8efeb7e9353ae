import { z } from 'zod'
import { convertPressureDifference } from '../gas/units'
import { ACCUMULATOR_TYPES, CORRECTION_METHODS } from '../types/registers'
import { registerQuery, text } from './common'
import { numberField, pressureBasisSchema, pressureUnitSchema, temperatureUnitSchema, volumeUnitSchema } from './quantities'

/** Servicing specifications: approved-data figures per part number and revision. */
const tablePointSchema = z.object({
  temperature: numberField('a temperature'),
  temperatureUnit: temperatureUnitSchema,
  pressure: numberField('a pressure').positive(),
})

const specificationFields = {
  partNumber: text('part number', 60),
  revision: text('revision', 20),
  title: text('title', 160),
  accumulatorType: z.enum(ACCUMULATOR_TYPES, {
    errorMap: () => ({ message: 'The type is piston, bladder or diaphragm.' }),
  }),
  gasVolume: numberField('the gas volume').positive('The gas volume must be above zero.'),
  gasVolumeUnit: volumeUnitSchema,
  pressureUnit: pressureUnitSchema,
  pressureBasis: pressureBasisSchema,
  referencePressure: numberField('the reference pre-charge').positive(),
  referenceTemperature: numberField('the reference temperature'),
  referenceTemperatureUnit: temperatureUnitSchema,
  toleranceMinus: numberField('a tolerance').nonnegative(),
  tolerancePlus: numberField('a tolerance').nonnegative(),
  toleranceUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%'], {
    errorMap: () => ({ message: 'The tolerance unit is psi, bar, kPa, MPa or %.' }),
  }),
  correctionMethod: z.enum(CORRECTION_METHODS, {
    errorMap: () => ({ message: 'The correction method is gas-law or table.' }),
  }),
  gasModel: z.enum(['real', 'ideal']).default('real'),
  maxPressure: numberField('the maximum working pressure').positive(),
  minPressure: numberField('the minimum working pressure').positive(),
  settleMinutes: z.number({ invalid_type_error: 'Whole minutes.' }).int('Whole minutes.').min(0).max(600),
  checkIntervalDays: z.number().int().positive().max(3650).nullable().default(null),
  lossThresholdPerDay: z.number().positive().nullable().default(null),
  dataReference: text('approved-data reference', 120),
  dataRevision: text('approved-data revision', 40),
  tablePoints: z.array(tablePointSchema).max(50).default([]),
}

function specificationRules(body: Partial<z.infer<z.ZodObject<typeof specificationFields>>>, context: z.RefinementCtx) {
  if (body.minPressure !== undefined && body.maxPressure !== undefined && body.minPressure >= body.maxPressure) {
    context.addIssue({
      code: 'custom',
      path: ['minPressure'],
      message: 'The minimum working pressure must be below the maximum.',
    })
  }
  if (
    body.referencePressure !== undefined
    && body.maxPressure !== undefined
    && body.referencePressure >= body.maxPressure
  ) {
    context.addIssue({
      code: 'custom',
      path: ['referencePressure'],
      message: 'The pre-charge must be below the maximum working pressure.',
    })
  }
  if (
    body.toleranceMinus !== undefined
    && body.toleranceUnit !== undefined
    && body.referencePressure !== undefined
    && body.pressureUnit !== undefined
  ) {
    // The low end of the band has to be a pressure the gas can hold.
    const minus
      = body.toleranceUnit === '%'
        ? (body.toleranceMinus / 100) * body.referencePressure
        : convertPressureDifference(body.toleranceMinus, body.toleranceUnit, body.pressureUnit)
    if (minus >= body.referencePressure)
      context.addIssue({
        code: 'custom',
        path: ['toleranceMinus'],
        message: 'The minus tolerance must be smaller than the reference pre-charge.',
      })
  }
  if (body.correctionMethod === 'table' && (body.tablePoints?.length ?? 0) < 2) {
    context.addIssue({
      code: 'custom',
      path: ['tablePoints'],
      message: 'A table correction needs at least two points from the approved data.',
    })
  }
}

export const specificationSchema = z.object(specificationFields).strict().superRefine(specificationRules)
export type SpecificationBody = z.infer<typeof specificationSchema>

/** Fields an engineer may change in place; any other change is a new revision. */
export const SPECIFICATION_LOCAL_FIELDS = ['title', 'checkIntervalDays', 'lossThresholdPerDay'] as const

export const specificationUpdateSchema = z
  .object(specificationFields)
  .partial()
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')
  .superRefine(specificationRules)

export const specificationQuerySchema = z.object({
  ...registerQuery,
  status: z.enum(['current', 'superseded', 'all']).default('current'),
  accumulatorType: z.enum(ACCUMULATOR_TYPES).optional(),
  sort: z.enum(['partNumber', 'revision', 'title', 'accumulatorType']).default('partNumber'),
})
