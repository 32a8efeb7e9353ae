import { z } from 'zod'
import './plain-words'

/** Filters of the fleet's pre-charge trend ranking. */
export const trendQuerySchema = z.object({
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  position: z.string().max(80).optional(),
  partNumber: z.string().max(60).optional(),
  flagged: z.enum(['true', 'false']).transform(value => value === 'true').optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(100, 'At most 100 a page.').default(50),
}).strict()

/** A page of the systems' pump-cycle trends. */
export const cycleTrendQuerySchema = z.object({
  flagged: z.enum(['true', 'false']).transform(value => value === 'true').optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(100, 'At most 100 a page.').default(25),
}).strict()

/** One system's whole series of pump-cycle checks. */
export const cycleSeriesQuerySchema = z.object({
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.'),
  system: z.string().trim().min(1).max(80),
}).strict()

/** One unit's pre-charge trend, by the unit's id. */
export const unitTrendParamsSchema = z.object({
  accumulatorId: z.coerce.number({ invalid_type_error: 'The id must be a number.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
})
