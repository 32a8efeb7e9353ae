import { z } from 'zod'
import { csvRow } from './plain-words'
import { convertPressureDifference } from '../gas/units'
import { ACCUMULATOR_TYPES, CORRECTION_METHODS, TOOL_KINDS } from '../types/registers'
import { numberField, pressureBasisSchema, pressureUnitSchema, temperatureUnitSchema, volumeUnitSchema } from './quantities'

const text = (what: string, max = 80) => z.string({ required_error: `Enter the ${what}.`, invalid_type_error: `Enter the ${what}.` }).trim().min(1, `Enter the ${what}.`).max(max)
const isoDate = z.string().date('Use a date like 2026-01-31.')

/** A page of a register: search, sort, pages. Each register adds its own filters. */
export const registerQuery = {
  q: z.string().trim().max(80).optional(),
  direction: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(25),
}
const booleanQuery = z.enum(['true', 'false']).transform(value => value === 'true').optional()

// Aircraft ------------------------------------------------------------------

export const aircraftSchema = z.object({
  registration: text('registration', 20).transform(value => value.toUpperCase()).refine(value => /^[A-Z0-9-]{2,20}$/.test(value), 'Letters, digits and hyphens only.'),
  fleetNumber: text('fleet number', 20),
  type: text('aircraft type', 60),
  base: text('base', 60),
  active: z.boolean().default(true),
}).strict()
export const aircraftUpdateSchema = aircraftSchema.partial().strict().refine(body => Object.keys(body).length > 0, 'Nothing to change.')
export const aircraftQuerySchema = z.object({ ...registerQuery, type: z.string().max(60).optional(), base: z.string().max(60).optional(), active: booleanQuery, sort: z.enum(['registration', 'fleetNumber', 'type', 'base']).default('registration') })

// Accumulators --------------------------------------------------------------

export const accumulatorSchema = z.object({
  partNumber: text('part number', 60),
  serialNumber: text('serial number', 60),
  system: z.string().trim().max(80).nullable().default(null),
  aircraftId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable().default(null),
  position: z.string().trim().max(80).nullable().default(null),
  installedAt: isoDate.nullable().default(null),
}).strict().superRefine((body, context) => {
  if (body.aircraftId && !body.position) context.addIssue({ code: 'custom', path: ['position'], message: 'Give the position on the aircraft.' })
  if (body.aircraftId && !body.installedAt) context.addIssue({ code: 'custom', path: ['installedAt'], message: 'Give the date it was installed.' })
})

/** Moving a unit: off its aircraft (aircraftId null) or onto another; its history is kept. */
export const accumulatorMoveSchema = z.object({
  aircraftId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable(),
  position: z.string().trim().max(80).optional(),
  date: isoDate,
  reason: z.string().trim().max(200).optional(),
}).strict().superRefine((move, context) => {
  if (move.aircraftId && !move.position) context.addIssue({ code: 'custom', path: ['position'], message: 'Give the new position.' })
})

export const accumulatorUpdateSchema = z.object({
  partNumber: text('part number', 60).optional(),
  serialNumber: text('serial number', 60).optional(),
  system: z.string().trim().max(80).nullable().optional(),
  move: accumulatorMoveSchema.optional(),
}).strict().refine(body => Object.keys(body).length > 0, 'Nothing to change.')

export const accumulatorQuerySchema = z.object({
  ...registerQuery,
  installed: booleanQuery,
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  partNumber: z.string().max(60).optional(),
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  sort: z.enum(['partNumber', 'serialNumber', 'position', 'installedAt']).default('partNumber'),
})

// Specifications ------------------------------------------------------------

const tablePointSchema = z.object({ temperature: numberField('a temperature'), temperatureUnit: temperatureUnitSchema, pressure: numberField('a pressure').positive() })

const specificationFields = {
  partNumber: text('part number', 60),
  revision: text('revision', 20),
  title: text('title', 160),
  accumulatorType: z.enum(ACCUMULATOR_TYPES, { errorMap: () => ({ message: 'The type is piston, bladder or diaphragm.' }) }),
  gasVolume: numberField('the gas volume').positive('The gas volume must be above zero.'),
  gasVolumeUnit: volumeUnitSchema,
  pressureUnit: pressureUnitSchema,
  pressureBasis: pressureBasisSchema,
  referencePressure: numberField('the reference pre-charge').positive(),
  referenceTemperature: numberField('the reference temperature'),
  referenceTemperatureUnit: temperatureUnitSchema,
  toleranceMinus: numberField('a tolerance').nonnegative(),
  tolerancePlus: numberField('a tolerance').nonnegative(),
  toleranceUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%'], { errorMap: () => ({ message: 'The tolerance unit is psi, bar, kPa, MPa or %.' }) }),
  correctionMethod: z.enum(CORRECTION_METHODS, { errorMap: () => ({ message: 'The correction method is gas-law or table.' }) }),
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
    context.addIssue({ code: 'custom', path: ['minPressure'], message: 'The minimum working pressure must be below the maximum.' })
  }
  if (body.referencePressure !== undefined && body.maxPressure !== undefined && body.referencePressure >= body.maxPressure) {
    context.addIssue({ code: 'custom', path: ['referencePressure'], message: 'The pre-charge must be below the maximum working pressure.' })
  }
  if (body.toleranceMinus !== undefined && body.toleranceUnit !== undefined && body.referencePressure !== undefined && body.pressureUnit !== undefined) {
    // The low end of the band has to be a pressure the gas can hold.
    const minus = body.toleranceUnit === '%' ? body.toleranceMinus / 100 * body.referencePressure : convertPressureDifference(body.toleranceMinus, body.toleranceUnit, body.pressureUnit)
    if (minus >= body.referencePressure) context.addIssue({ code: 'custom', path: ['toleranceMinus'], message: 'The minus tolerance must be smaller than the reference pre-charge.' })
  }
  if (body.correctionMethod === 'table' && (body.tablePoints?.length ?? 0) < 2) {
    context.addIssue({ code: 'custom', path: ['tablePoints'], message: 'A table correction needs at least two points from the approved data.' })
  }
}

export const specificationSchema = z.object(specificationFields).strict().superRefine(specificationRules)
export type SpecificationBody = z.infer<typeof specificationSchema>

/** Fields an engineer may change in place; any other change is a new revision. */
export const SPECIFICATION_LOCAL_FIELDS = ['title', 'checkIntervalDays', 'lossThresholdPerDay'] as const

export const specificationUpdateSchema = z.object(specificationFields).partial().strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')
  .superRefine(specificationRules)

export const specificationQuerySchema = z.object({
  ...registerQuery,
  status: z.enum(['current', 'superseded', 'all']).default('current'),
  accumulatorType: z.enum(ACCUMULATOR_TYPES).optional(),
  sort: z.enum(['partNumber', 'revision', 'title', 'accumulatorType']).default('partNumber'),
})

// Tools ---------------------------------------------------------------------

export const toolSchema = z.object({
  kind: z.enum(TOOL_KINDS, { errorMap: () => ({ message: 'The kind is gauge or cart.' }) }),
  assetNumber: text('asset number', 40),
  description: text('description', 160),
  rangeMax: z.number().positive().nullable().default(null),
  rangeUnit: pressureUnitSchema.nullable().default(null),
  resolution: z.number().positive().nullable().default(null),
  accuracy: z.number().positive().nullable().default(null),
  accuracyUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%FS']).nullable().default(null),
  calibrationDue: isoDate.nullable().default(null),
  active: z.boolean().default(true),
}).strict().superRefine((tool, context) => {
  if (tool.kind === 'gauge') {
    if (!tool.rangeMax || !tool.rangeUnit) context.addIssue({ code: 'custom', path: ['rangeMax'], message: 'A gauge needs its range.' })
    if (!tool.accuracy || !tool.accuracyUnit) context.addIssue({ code: 'custom', path: ['accuracy'], message: 'A gauge needs its accuracy.' })
  }
})
export const toolUpdateSchema = z.object({
  description: text('description', 160).optional(),
  rangeMax: z.number().positive().nullable().optional(),
  rangeUnit: pressureUnitSchema.nullable().optional(),
  resolution: z.number().positive().nullable().optional(),
  accuracy: z.number().positive().nullable().optional(),
  accuracyUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%FS']).nullable().optional(),
  calibrationDue: isoDate.nullable().optional(),
  active: z.boolean().optional(),
}).strict().refine(body => Object.keys(body).length > 0, 'Nothing to change.')
export const toolQuerySchema = z.object({
  ...registerQuery,
  kind: z.enum(TOOL_KINDS).optional(),
  calibration: z.enum(['expired', 'valid']).optional(),
  active: booleanQuery,
  sort: z.enum(['assetNumber', 'kind', 'calibrationDue', 'description']).default('assetNumber'),
})

// CSV -----------------------------------------------------------------------

/** CSV cells are text: empty means "not given", numbers and booleans are read from their text. */
const cell = {
  text: z.string().trim(),
  optionalText: z.string().trim().transform(value => value || null),
  number: z.string({ required_error: 'The column is missing or the cell is empty.' }).trim().min(1, 'Give a number.').transform(Number)
    .pipe(z.number({ invalid_type_error: 'Not a number.' }).finite('Not a number.')),
  optionalNumber: z.string().trim().transform(value => value === '' ? null : Number(value)).pipe(z.number({ invalid_type_error: 'Not a number.' }).finite('Not a number.').nullable()),
  boolean: z.string().trim().toLowerCase().transform(value => value === '' || ['true', 'yes', '1'].includes(value)),
}

export const aircraftCsvRow = csvRow({ registration: cell.text, fleetNumber: cell.text, type: cell.text, base: cell.text, active: cell.boolean.default('true') }, aircraftSchema)

export const accumulatorCsvRow = z.object({
  partNumber: cell.text, serialNumber: cell.text, system: cell.optionalText.default(''),
  registration: cell.optionalText.default(''), position: cell.optionalText.default(''), installedAt: cell.optionalText.default(''),
})

export const toolCsvRow = csvRow({
  kind: cell.text, assetNumber: cell.text, description: cell.text,
  rangeMax: cell.optionalNumber.default(''), rangeUnit: cell.optionalText.default(''), resolution: cell.optionalNumber.default(''),
  accuracy: cell.optionalNumber.default(''), accuracyUnit: cell.optionalText.default(''), calibrationDue: cell.optionalText.default(''),
  active: cell.boolean.default('true'),
}, toolSchema)

/** Table points in one cell: "-40 C 1170; 0 C 1390; 20 C 1500". */
const tablePointsCell = z.string().trim().transform((value, context) => {
  if (!value) return []
  return value.split(';').map((entry) => {
    const match = entry.trim().match(/^(-?\d+(?:\.\d+)?)\s*([CFKR])\s+(\d+(?:\.\d+)?)$/)
    if (!match) {
      context.addIssue({ code: 'custom', message: `"${entry.trim()}" is not "temperature unit pressure", e.g. "-40 C 1170".` })
      return { temperature: 0, temperatureUnit: 'C' as const, pressure: 0 }
    }
    return { temperature: Number(match[1]), temperatureUnit: match[2] as 'C', pressure: Number(match[3]) }
  })
})

export const specificationCsvRow = csvRow({
  partNumber: cell.text, revision: cell.text, title: cell.text, accumulatorType: cell.text,
  gasVolume: cell.number, gasVolumeUnit: cell.text, pressureUnit: cell.text, pressureBasis: cell.text,
  referencePressure: cell.number, referenceTemperature: cell.number, referenceTemperatureUnit: cell.text,
  toleranceMinus: cell.number, tolerancePlus: cell.number, toleranceUnit: cell.text, correctionMethod: cell.text,
  gasModel: cell.text.default('real'), maxPressure: cell.number, minPressure: cell.number, settleMinutes: cell.number,
  checkIntervalDays: cell.optionalNumber.default(''), lossThresholdPerDay: cell.optionalNumber.default(''),
  dataReference: cell.text, dataRevision: cell.text, tablePoints: tablePointsCell.default(''),
}, specificationSchema)
