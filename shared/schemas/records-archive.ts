import { z } from 'zod'
import './plain-words'

const day = (what: string) => z.string({ required_error: `Give the ${what} date.` }).date(`The ${what} date is a calendar date, like 2026-01-31.`)

/** A period's released records, optionally of one station and one operator (by name or code). */
export const recordsArchiveQuerySchema = z
  .object({
    from: day('first'),
    to: day('last'),
    station: z.string().trim().min(1).max(60).optional(),
    operator: z.string().trim().min(1).max(80).optional(),
  })
  .strict()
  .refine(query => query.to >= query.from, { message: 'The last date cannot come before the first.', path: ['to'] })
export type RecordsArchiveQuery = z.infer<typeof recordsArchiveQuerySchema>
