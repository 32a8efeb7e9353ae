import { z } from 'zod'
import { AUTHORISATION_PRIVILEGES } from '../types/authorisation'

const day = (what: string) => z.string({ required_error: `Give the ${what} date.` })
  .regex(/^\d{4}-\d{2}-\d{2}$/, `The ${what} date is a calendar date, YYYY-MM-DD.`)
  .refine(value => !Number.isNaN(new Date(`${value}T00:00:00Z`).getTime()) && new Date(`${value}T00:00:00Z`).toISOString().startsWith(value), `The ${what} date is not a real date.`)

const terms = {
  privileges: z.enum(AUTHORISATION_PRIVILEGES, { errorMap: () => ({ message: 'Choose perform, inspect or both.' }) }),
  scopeKind: z.enum(['part-numbers', 'aircraft-types'], { errorMap: () => ({ message: 'Choose part numbers or aircraft types.' }) }),
  scope: z.array(z.string().trim().min(1, 'A scope entry is empty.').max(60, 'A scope entry is at most 60 characters.'))
    .min(1, 'Name at least one part number or aircraft type it covers.').max(100, 'At most 100 scope entries.'),
  expiresOn: day('expiry'),
  issuingBody: z.string({ required_error: 'Name the issuing body.' }).trim().min(1, 'Name the issuing body.').max(120, 'At most 120 characters.'),
}

/** A new entry of the register of certifying authorisations. */
export const authorisationCreateSchema = z
  .object({
    holderId: z.number({ required_error: 'Choose the holder.', invalid_type_error: 'Choose the holder.' }).int().positive(),
    number: z.string({ required_error: 'Give the authorisation number.' }).trim().min(1, 'Give the authorisation number.').max(40, 'At most 40 characters.')
      .regex(/^[A-Za-z0-9][A-Za-z0-9/.-]*$/, 'Letters, digits, "-", "/" and "." only.'),
    issuedOn: day('issue'),
    ...terms,
  })
  .strict()
  .refine(body => body.expiresOn >= body.issuedOn, { message: 'It cannot expire before it is issued.', path: ['expiresOn'] })

/** A change of an authorisation's terms (a renewal moves its expiry). */
export const authorisationUpdateSchema = z.object(terms).partial().strict()
  .refine(body => Object.keys(body).length > 0, { message: 'Nothing to change.', path: ['expiresOn'] })

export const suspensionSchema = z
  .object({ reason: z.string({ required_error: 'Say why it is suspended.' }).trim().min(3, 'Say why it is suspended.').max(500, 'At most 500 characters.') })
  .strict()

export type AuthorisationCreateBody = z.infer<typeof authorisationCreateSchema>
export type AuthorisationUpdateBody = z.infer<typeof authorisationUpdateSchema>
