import { z } from 'zod'
import { SIGNING_RULES } from '../types/signing'

const base64url = (field: string, max: number) =>
  z.string({ required_error: `${field} is missing.` }).min(1, `${field} is missing.`).max(max, `${field} is too long.`)
    .regex(/^[A-Za-z0-9_-]+$/, `${field} must be base64url.`)

/** A WebAuthn assertion as @simplewebauthn/browser answers it (signing with a passkey). */
export const passkeyAssertionSchema = z
  .object({
    id: base64url('The credential id', 1400),
    rawId: base64url('The credential id', 1400),
    type: z.literal('public-key'),
    response: z.object({
      clientDataJSON: base64url('The client data', 8000),
      authenticatorData: base64url('The authenticator data', 8000),
      signature: base64url('The signature', 2000),
      userHandle: base64url('The user handle', 400).optional(),
    }),
    clientExtensionResults: z.record(z.unknown()).default({}),
    authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
  })

/** A signature's body: the statement confirmed, and the password re-entered or a passkey's assertion. */
export const signatureBodySchema = z
  .object({
    certify: z.literal(true, { errorMap: () => ({ message: 'Confirm the statement to sign.' }) }),
    password: z.string().min(1, 'Enter your password to sign.').max(1000).optional(),
    passkey: passkeyAssertionSchema.optional(),
  })
  .strict()
  .refine(body => body.password || body.passkey, { message: 'Enter your password to sign, or use a passkey.', path: ['password'] })

/** A registration answer as @simplewebauthn/browser gives it, with the name the user gives the passkey. */
export const passkeyRegistrationSchema = z
  .object({
    name: z.string({ required_error: 'Give the passkey a name.' }).trim().min(1, 'Give the passkey a name.').max(80, 'At most 80 characters.'),
    ticket: z.string().min(1, 'The registration ticket is missing.').max(1000),
    response: z.object({
      id: base64url('The credential id', 1400),
      rawId: base64url('The credential id', 1400),
      type: z.literal('public-key'),
      response: z.object({
        clientDataJSON: base64url('The client data', 8000),
        attestationObject: base64url('The attestation', 16000),
        authenticatorData: base64url('The authenticator data', 8000).optional(),
        transports: z.array(z.enum(['ble', 'cable', 'hybrid', 'internal', 'nfc', 'smart-card', 'usb'])).max(8).optional(),
        publicKeyAlgorithm: z.number().int().optional(),
        publicKey: base64url('The public key', 8000).optional(),
      }),
      clientExtensionResults: z.record(z.unknown()).default({}),
      authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
    }),
  })
  .strict()

export const passkeyNameSchema = passkeyRegistrationSchema.shape.name

export const signingOptionsQuerySchema = z.object({
  capacity: z.enum(['performer', 'inspector'], { errorMap: () => ({ message: 'Say performer or inspector.' }) }),
}).strict()

export const signingPolicySchema = z
  .object({
    performer: z.enum(SIGNING_RULES, { errorMap: () => ({ message: 'Choose password, passkey or either.' }) }),
    inspector: z.enum(SIGNING_RULES, { errorMap: () => ({ message: 'Choose password, passkey or either.' }) }),
  })
  .strict()

export type SignatureBody = z.infer<typeof signatureBodySchema>
