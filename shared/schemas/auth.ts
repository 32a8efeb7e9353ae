import { z } from 'zod'
import './plain-words'
import { ROLES } from '../types/user'
import { numberField, pressureUnitSchema } from './quantities'

export const loginSchema = z.object({
  email: z.string({ required_error: 'Enter your e-mail address.' }).trim().toLowerCase().email('Enter a valid e-mail address.'),
  password: z.string({ required_error: 'Enter your password.' }).min(1, 'Enter your password.'),
})
export type LoginBody = z.infer<typeof loginSchema>

export const passwordSchema = z.string({ required_error: 'Enter a password.' })
  .min(12, 'A password needs at least 12 characters.')
  .max(200, 'At most 200 characters.')

const rolesSchema = z.array(z.enum(ROLES, { errorMap: () => ({ message: `A role is one of: ${ROLES.join(', ')}.` }) }))
  .min(1, 'Give the user at least one role.')
  .transform(roles => [...new Set(roles)])

const authorisationNumberSchema = z.string().trim().max(40).transform(value => value || null).nullable()

export const userCreateSchema = z.object({
  email: z.string({ required_error: 'Enter an e-mail address.' }).trim().toLowerCase().email('Enter a valid e-mail address.'),
  name: z.string({ required_error: 'Enter a name.' }).trim().min(2, 'Enter the full name.').max(120),
  roles: rolesSchema,
  authorisationNumber: authorisationNumberSchema.optional(),
  password: passwordSchema,
})
export type UserCreateBody = z.infer<typeof userCreateSchema>

export const userUpdateSchema = z.object({
  name: z.string().trim().min(2, 'Enter the full name.').max(120).optional(),
  roles: rolesSchema.optional(),
  authorisationNumber: authorisationNumberSchema.optional(),
  disabled: z.boolean({ invalid_type_error: 'Must be true or false.' }).optional(),
}).refine(body => Object.keys(body).length > 0, 'Nothing to change.')
export type UserUpdateBody = z.infer<typeof userUpdateSchema>

export const passwordResetSchema = z.object({ password: passwordSchema }).strict()

/** A user changing their own password: the current one proves it is them. */
export const passwordChangeSchema = z.object({
  currentPassword: z.string({ required_error: 'Enter your current password.' }).min(1, 'Enter your current password.'),
  newPassword: passwordSchema,
}).strict().refine(body => body.newPassword !== body.currentPassword, { message: 'Choose a password different from the current one.', path: ['newPassword'] })
export type PasswordChangeBody = z.infer<typeof passwordChangeSchema>

/** The change-password form: the payload and the new password typed twice. */
export const passwordChangeFormSchema = z.object({
  currentPassword: z.string({ required_error: 'Enter your current password.' }).min(1, 'Enter your current password.'),
  newPassword: passwordSchema,
  repeatPassword: z.string({ required_error: 'Type the new password again.' }),
}).refine(body => body.newPassword === body.repeatPassword, { message: 'The two new passwords differ.', path: ['repeatPassword'] })
  .refine(body => body.newPassword !== body.currentPassword, { message: 'Choose a password different from the current one.', path: ['newPassword'] })

export const preferencesSchema = z.object({
  pressureUnit: pressureUnitSchema,
  temperatureUnit: z.enum(['C', 'F'], { errorMap: () => ({ message: 'Temperature unit must be C or F.' }) }),
  volumeUnit: z.enum(['in3', 'L'], { errorMap: () => ({ message: 'Volume unit must be in3 or L.' }) }),
  stationElevation: z.object({ value: numberField('an elevation'), unit: z.enum(['m', 'ft']) })
    .refine(({ value, unit }) => {
      const metres = unit === 'ft' ? value * 0.3048 : value
      return metres >= -610 && metres <= 11000
    }, { message: 'Station elevation must lie between −610 m and 11 000 m (−2000 ft and 36 000 ft).', path: ['value'] }),
  stationName: z.string().trim().max(60),
})

/** Where to go after signing in through the organisation's identity provider (a path of this app). */
export const ssoStartQuerySchema = z.object({
  next: z.string().max(500).regex(/^\/(?!\/)/, 'A path of this app, like /worksheets.').optional(),
}).strict()

/** What the identity provider sends the browser back with (RFC 6749 §4.1.2; OpenID Connect adds `iss`). */
export const ssoCallbackQuerySchema = z.object({
  code: z.string().max(2000).optional(),
  state: z.string().max(500).optional(),
  iss: z.string().max(500).optional(),
  session_state: z.string().max(500).optional(),
  error: z.string().max(200).optional(),
  error_description: z.string().max(1000).optional(),
}).strict()
