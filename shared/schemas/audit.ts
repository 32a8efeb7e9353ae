import { z } from 'zod'
import './plain-words'

/** The audit view: newest first, optionally one kind of record, one page at a time. */
export const auditEventQuerySchema = z.object({
  entity: z.enum(['worksheet', 'specification', 'tool', 'user', 'aircraft', 'accumulator', 'cycle-check']).optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
}).strict()
