import { z } from 'zod'
import './plain-words'

/** Filters of the fleet's pre-charge trend ranking. */
export const trendQuerySchema = z.object({
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  position: z.string().max(80).optional(),
  partNumber: z.string().max(60).optional(),
  flagged: z.enum(['true', 'false']).transform(value => value === 'true').optional(),
}).strict()
