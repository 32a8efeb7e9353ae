import { z } from 'zod'
import './plain-words'
import { WORKSHEET_REASONS, WORKSHEET_STATES } from '../types/worksheet'
import { ambientSchema, gasTemperatureSchema, numberField, pressureSchema } from './quantities'

export const worksheetCreateSchema = z
  .object({
    accumulatorId: z
      .number({
        required_error: 'Pick the installed accumulator.',
        invalid_type_error: 'Pick the installed accumulator.',
      })
      .int()
      .positive()
      .max(2_147_483_647, 'Not a known id.'),
    workOrder: z
      .string({ required_error: 'Enter the work order.' })
      .trim()
      .min(3, 'Enter the work order reference.')
      .max(60),
    reason: z.enum(WORKSHEET_REASONS, {
      errorMap: () => ({ message: `The reason is one of: ${WORKSHEET_REASONS.join(', ')}.` }),
    }),
    correctsId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  })
  .strict()
export type WorksheetCreateBody = z.infer<typeof worksheetCreateSchema>

const confirmation = z.boolean({ invalid_type_error: 'Confirm with true.' }).optional()

export const preparationStepSchema = z
  .object({
    step: z.literal('preparation'),
    systemDepressurised: confirmation,
    aircraftSafe: confirmation,
    eyeProtection: confirmation,
    nitrogenOnly: confirmation,
  })
  .strict()

export const toolsStepSchema = z
  .object({
    step: z.literal('tools'),
    gaugeId: z
      .number({ required_error: 'Pick the gauge you used.', invalid_type_error: 'Pick the gauge you used.' })
      .int()
      .positive()
      .max(2_147_483_647, 'Not a known id.'),
    cartId: z
      .number({
        required_error: 'Pick the nitrogen cart you used.',
        invalid_type_error: 'Pick the nitrogen cart you used.',
      })
      .int()
      .positive()
      .max(2_147_483_647, 'Not a known id.'),
  })
  .strict()

export const conditionsStepSchema = z
  .object({
    step: z.literal('conditions'),
    gasTemperature: gasTemperatureSchema,
    temperatureMethod: z.enum(['ambient-shade', 'shell'], {
      errorMap: () => ({ message: 'Say how the temperature was taken: ambient-shade or shell.' }),
    }),
    minutesSinceOperated: numberField('the minutes since the system was last operated')
      .int('Whole minutes, please.')
      .min(0, 'The minutes since the system was last operated cannot be negative.')
      .max(
        43_200,
        'At most 43 200 minutes (30 days): the gas has long settled by then; enter 43 200 for anything longer.',
      ),
    ambient: ambientSchema,
  })
  .strict()

const readingSchema = pressureSchema.refine(pressure => pressure.value > 0, {
  message: 'A pre-charge reading is above zero.',
  path: ['value'],
})

export const asFoundStepSchema = z.object({ step: z.literal('asFound'), reading: readingSchema }).strict()

export const actionStepSchema = z
  .object({
    step: z.literal('action'),
    kind: z.enum(['none', 'charge', 'vent'], { errorMap: () => ({ message: 'The action is none, charge or vent.' }) }),
  })
  .strict()

export const asLeftStepSchema = z
  .object({
    step: z.literal('asLeft'),
    reading: readingSchema,
    gasTemperature: gasTemperatureSchema,
    /** The technician confirms an as-left that moved with no charge or vent recorded. */
    confirmedUnchanged: z.boolean().optional(),
  })
  .strict()

export const finishStepSchema = z
  .object({
    step: z.literal('finish'),
    valveLeakCheck: z.literal(true, {
      errorMap: () => ({ message: 'Leak-check the charging valve (leak-detection fluid, no bubbles) and confirm it.' }),
    }),
    capFitted: z.literal(true, { errorMap: () => ({ message: 'Refit the charging valve cap and confirm it.' }) }),
    remarks: z.string().trim().max(2000).default(''),
    unserviceableReference: z
      .string()
      .trim()
      .max(80)
      .transform(value => value || null)
      .nullable()
      .default(null),
  })
  .strict()

/** The technician has read what changed when a worksheet filled offline reached the server. */
export const reviewSyncStepSchema = z
  .object({
    step: z.literal('reviewSync'),
    reviewed: z.literal(true, { errorMap: () => ({ message: 'Confirm you have read what changed when the worksheet was sent.' }) }),
  })
  .strict()

/** One step of the worksheet, saved as it is completed. */
export const worksheetStepSchema = z.discriminatedUnion(
  'step',
  [
    preparationStepSchema,
    toolsStepSchema,
    conditionsStepSchema,
    asFoundStepSchema,
    actionStepSchema,
    asLeftStepSchema,
    finishStepSchema,
    reviewSyncStepSchema,
  ],
  {
    errorMap: (issue, context) =>
      issue.code === 'invalid_union_discriminator'
        ? { message: 'Say which step: preparation, tools, conditions, asFound, action, asLeft, finish or reviewSync.' }
        : { message: context.defaultError },
  },
)
export type WorksheetStepBody = z.infer<typeof worksheetStepSchema>

export const signatureSchema = z
  .object({
    password: z.string({ required_error: 'Enter your password to sign.' }).min(1, 'Enter your password to sign.'),
    certify: z.literal(true, { errorMap: () => ({ message: 'Confirm the statement to sign.' }) }),
  })
  .strict()

export const reasonSchema = z
  .object({
    reason: z.string({ required_error: 'Give the reason.' }).trim().min(5, 'Give the reason in a few words.').max(2000),
  })
  .strict()

const worksheetFilterFields = {
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  accumulatorId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  state: z.enum(WORKSHEET_STATES).optional(),
  performerId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  /** Worksheets done with this gauge or nitrogen cart (a tool's traceability). */
  toolId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  from: z.string().date('Use a date like 2026-01-31.').optional(),
  to: z.string().date('Use a date like 2026-01-31.').optional(),
  /** Start of a work order, registration, serial number or part number, any case. */
  q: z.string().trim().max(60, 'At most 60 characters.').optional(),
  sort: z.enum(['performedAt', 'createdAt', 'state', 'workOrder']).default('createdAt'),
  direction: z.enum(['asc', 'desc']).default('desc'),
}

/**
 * The worksheet list: filters, search, sort, and a page by cursor (the `next` or `previous` of the last answer).
 * Unknown parameters are refused.
 */
export const worksheetListQuerySchema = z
  .object({
    ...worksheetFilterFields,
    cursor: z.string().max(400).optional(),
    pageSize: z.coerce.number().int().min(1).max(200).default(25),
  })
  .strict()

/** The same filters for the CSV export, which has every matching row and no pages. */
export const worksheetExportQuerySchema = z.object(worksheetFilterFields).strict()
export type WorksheetListQuery = z.infer<typeof worksheetListQuerySchema>

/** Discarding a draft: the reason is optional (a slip, the wrong unit); the record says it was discarded. */
export const discardSchema = z
  .object({
    reason: z.string().trim().max(500).default(''),
  })
  .strict()

/**
 * A worksheet started and filled on a device with no signal, sent whole when the connection
 * returns: the server starts it (once, by `clientId`), replays every step at the time the device
 * took it, and reports what it could not accept. `specificationId` is the revision the device used.
 */
export const offlineWorksheetSchema = worksheetCreateSchema.extend({
  clientId: z.string().uuid('The device\'s worksheet id is not a UUID.'),
  specificationId: z.number().int().positive().max(2_147_483_647, 'Not a known id.'),
  startedAt: z.string().datetime({ offset: true, message: 'Give the start time as ISO 8601.' }),
  steps: z.array(z.object({
    at: z.string().datetime({ offset: true, message: 'Give each step\'s time as ISO 8601.' }),
    body: worksheetStepSchema,
  }).strict()).max(60, 'At most 60 steps.'),
}).strict()
export type OfflineWorksheetBody = z.infer<typeof offlineWorksheetSchema>
