import { z } from 'zod'
import { UNIT_BUCKETS } from '../utils/field-reference-delta'

const digest = z.string().regex(/^[0-9a-z]{1,12}$/, 'Not a digest of the station copy.')

/**
 * The station copy's query: nothing for the whole copy, or the digests of the copy the device holds
 * (all three) for only what changed since.
 */
export const fieldReferenceQuerySchema = z
  .object({
    units: z
      .string()
      .max(UNIT_BUCKETS * 13)
      .transform(text => text.split('.'))
      .pipe(z.array(digest).length(UNIT_BUCKETS, `Give the digests of all ${UNIT_BUCKETS} unit buckets.`))
      .optional(),
    specifications: digest.optional(),
    tools: digest.optional(),
  })
  .strict()
  .refine(
    query => [query.units, query.specifications, query.tools].every(part => part === undefined)
      || [query.units, query.specifications, query.tools].every(part => part !== undefined),
    { message: 'Give the digests of units, specifications and tools together, or none.', path: ['units'] },
  )
