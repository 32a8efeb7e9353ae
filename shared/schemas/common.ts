import { z } from 'zod'
import './plain-words'

/** Schemas every domain uses: ids in the path, queries that take nothing, register pages, text and dates. */

export const idParamsSchema = z.object({
  id: z.coerce.number({ invalid_type_error: 'The id must be a number.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
})

/** For routes that take no query parameters: any given is refused, like unknown body fields. */
export const noQuerySchema = z.object({}).strict()

/** A required piece of text, with a message that names it. */
export const text = (what: string, max = 80) =>
  z.string({ required_error: `Enter the ${what}.`, invalid_type_error: `Enter the ${what}.` }).trim().min(1, `Enter the ${what}.`).max(max)

export const isoDate = z.string().date('Use a date like 2026-01-31.')

/** A page of a register: search, sort, pages. Each register adds its own filters. */
export const registerQuery = {
  q: z.string().trim().max(80).optional(),
  direction: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(25),
}

export const booleanQuery = z.enum(['true', 'false']).transform(value => value === 'true').optional()

/** A user's passkey, by the user's id and the passkey's. */
export const userPasskeyParamsSchema = z.object({
  id: z.coerce.number().int().positive(),
  passkeyId: z.coerce.number().int().positive(),
})
