import { z } from 'zod'
import { ambientSchema, intervalSchema, pressureSchema, temperatureSchema } from './quantities'

/** A pump cycle check: with no service selected, the time from pump cut-out to cut-in. */
export const cycleCheckSchema = z.object({
  aircraftId: z.number({ required_error: 'Pick the aircraft.', invalid_type_error: 'Pick the aircraft.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
  system: z.string({ required_error: 'Pick the hydraulic system.' }).trim().min(1, 'Pick the hydraulic system.').max(80),
  cutOut: pressureSchema,
  cutIn: pressureSchema,
  interval: intervalSchema,
  fluidTemperature: temperatureSchema,
  checkedAt: z.string().date('Use a date like 2026-01-31.').optional(),
  ambient: ambientSchema.optional(),
}).strict()
export type CycleCheckBody = z.infer<typeof cycleCheckSchema>

export const cycleCheckQuerySchema = z.object({
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  system: z.string().max(80).optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
}).strict()

export const trendQuerySchema = z.object({
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  position: z.string().max(80).optional(),
  partNumber: z.string().max(60).optional(),
  flagged: z.enum(['true', 'false']).transform(value => value === 'true').optional(),
}).strict()

/** For routes that take no query parameters: any given is refused, like unknown body fields. */
export const noQuerySchema = z.object({}).strict()
