import type { SignatureCapacity } from './worksheet'

/** How a signature was made. */
export type SignatureMethod = 'password' | 'passkey'

/** What an organisation asks of a signer in one capacity. */
export type SigningRule = 'password' | 'passkey' | 'either'
export const SIGNING_RULES = ['password', 'passkey', 'either'] as const satisfies readonly SigningRule[]
export const SIGNING_RULE_LABELS: Record<SigningRule, string> = {
  password: 'Password re-entered',
  passkey: 'Passkey (this device or a security key)',
  either: 'Passkey or password',
}

/** Per signing role: technicians sign as performer, inspectors countersign. */
export type SigningPolicy = Record<SignatureCapacity, SigningRule>
export const DEFAULT_SIGNING_POLICY: SigningPolicy = { performer: 'either', inspector: 'either' }
export const SIGNING_ROLE_LABELS: Record<SignatureCapacity, string> = {
  performer: 'Technicians, signing the work they did',
  inspector: 'Inspectors, countersigning and releasing',
}

/**
 * What a passkey signs. Its SHA-256 (canonical JSON) is the WebAuthn challenge, so the assertion
 * binds the person, the authenticator and the record's exact content (`contentHash`: the SHA-256 of
 * the record's field digests, see server/utils/record-proof.ts).
 */
export interface SigningPayload {
  /** The payload format. */
  format: 'chargewell-signature/1'
  worksheetId: number
  round: number
  capacity: SignatureCapacity
  signer: { id: number, name: string, authorisationNumber: string | null }
  statement: string
  contentHash: string
}

/** A WebAuthn assertion as the browser returned it (base64url fields). */
export interface SignatureAssertion {
  credentialId: string
  authenticatorData: string
  clientDataJSON: string
  signature: string
  userHandle?: string
}

/** One registered passkey, as its owner and administrators see it. */
export interface PasskeyDto {
  id: number
  name: string
  credentialId: string
  /** SHA-256 of the public key, first 16 hex digits in groups of four: what a verification report names. */
  fingerprint: string
  transports: string[]
  registeredAt: string
  revokedAt: string | null
  lastUsedAt: string | null
}

/** What the signing form needs to offer: the rule for this capacity and the signer's usable passkeys. */
export interface SigningOptionsDto {
  rule: SigningRule
  /** WebAuthn request options (challenge derived from the content), or null when the signer has no passkey. */
  passkey: Record<string, unknown> | null
  contentHash: string
}
