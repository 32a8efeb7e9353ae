import { z } from 'zod'
import { TOKEN_SCOPES, type TokenScope } from '../types/api-token'

const SCOPES = Object.keys(TOKEN_SCOPES) as [TokenScope, ...TokenScope[]]

/** A new API token: a name to recognise it by, what it may do, and how long it lives (at most a year). */
export const apiTokenCreateSchema = z
  .object({
    name: z.string({ required_error: 'Name the token (the system that will use it).' }).trim()
      .min(2, 'Name the token (the system that will use it).').max(80),
    scopes: z.array(z.enum(SCOPES, { errorMap: () => ({ message: `A scope is one of ${SCOPES.join(', ')}.` }) }))
      .min(1, 'Give the token at least one scope.')
      .transform(scopes => [...new Set(scopes)]),
    expiresInDays: z.number({ invalid_type_error: 'Give the days as a number.' }).int().min(1, 'At least one day.')
      .max(365, 'At most 365 days: issue a new token each year.').default(90),
  })
  .strict()
export type ApiTokenCreateBody = z.infer<typeof apiTokenCreateSchema>
