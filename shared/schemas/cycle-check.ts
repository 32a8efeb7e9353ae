import { z } from 'zod'
import './plain-words'
import { unitLabel } from '../gas/format'
import { convertPressureDifference, convertTemperature, intervalToSeconds } from '../gas/units'
import { ambientSchema, intervalSchema, pressureSchema, temperatureSchema } from './quantities'

/**
 * A cut-out to cut-in interval a person times with a watch: 5 seconds to 24 hours. Beyond a
 * day the system has been at rest, not cycling, and the figure is a slip (99,999 minutes);
 * common practice (no source).
 */
const CYCLE_INTERVAL_SECONDS = { min: 5, max: 24 * 3600 }
/** Hydraulic fluid temperatures a system works at: −60 °C to +150 °C; common practice (no source). */
const FLUID_TEMPERATURE_C = { min: -60, max: 150 }

const cycleCheckFields = z.object({
  aircraftId: z.number({ required_error: 'Pick the aircraft and system.', invalid_type_error: 'Pick the aircraft and system.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
  system: z.string({ required_error: 'Pick the hydraulic system.' }).trim().min(1, 'Pick the hydraulic system.').max(80),
  cutOut: pressureSchema,
  cutIn: pressureSchema,
  interval: intervalSchema,
  fluidTemperature: temperatureSchema,
  checkedAt: z.string().date('Use a date like 2026-01-31.').optional(),
  ambient: ambientSchema.optional(),
}).strict()

/** The rules between fields, all reported at once, each on its own field and in the unit typed. */
function cycleCheckRules(check: z.infer<typeof cycleCheckFields>, context: z.RefinementCtx) {
  const seconds = intervalToSeconds(check.interval)
  if (seconds < CYCLE_INTERVAL_SECONDS.min || seconds > CYCLE_INTERVAL_SECONDS.max) {
    const unit = check.interval.unit
    const inUnit = (value: number) => Number((value / intervalToSeconds({ value: 1, unit })).toPrecision(3))
    context.addIssue({
      code: 'custom', path: ['interval', 'value'],
      message: `A cut-out to cut-in interval is between ${inUnit(CYCLE_INTERVAL_SECONDS.min)} and ${inUnit(CYCLE_INTERVAL_SECONDS.max)} ${unit}; check the stopwatch reading and the unit.`,
    })
  }
  const cutIn = convertPressureDifference(check.cutIn.value, check.cutIn.unit, check.cutOut.unit)
  if (check.cutIn.basis === check.cutOut.basis && cutIn >= check.cutOut.value) {
    context.addIssue({ code: 'custom', path: ['cutIn', 'value'], message: `The pump cuts in below the pressure it cuts out at (${check.cutOut.value} ${check.cutOut.unit}).` })
  }
  const celsius = convertTemperature(check.fluidTemperature, 'C').value
  if (celsius < FLUID_TEMPERATURE_C.min || celsius > FLUID_TEMPERATURE_C.max) {
    const limit = (value: number) => Math.round(convertTemperature({ value, unit: 'C' }, check.fluidTemperature.unit).value)
    context.addIssue({
      code: 'custom', path: ['fluidTemperature', 'value'],
      message: `A hydraulic fluid temperature is between ${limit(FLUID_TEMPERATURE_C.min)} and ${limit(FLUID_TEMPERATURE_C.max)} ${unitLabel(check.fluidTemperature.unit)}.`,
    })
  }
}

/** A pump cycle check: with no service selected, the time from pump cut-out to cut-in. */
export const cycleCheckSchema = cycleCheckFields.superRefine(cycleCheckRules)
export type CycleCheckBody = z.infer<typeof cycleCheckSchema>

/** A correction replaces the check's figures; the server recomputes the leak rate. */
export const cycleCheckCorrectionSchema = cycleCheckSchema

/** A check withdrawn (a slip, the wrong aircraft): kept, with the reason, and left out of the trend. */
export const cycleCheckWithdrawSchema = z.object({
  reason: z.string({ required_error: 'Say why the check is withdrawn.' }).trim().min(5, 'Say why the check is withdrawn, in a few words.').max(500),
}).strict()

export const cycleCheckQuerySchema = z.object({
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  system: z.string().max(80).optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
}).strict()
