import { UniqueConstraintError, type Transaction } from 'sequelize'
import type { FrozenAuthorisation } from '#shared/types/authorisation'
import type { SignatureAssertion, SignatureMethod, SigningPayload, SigningRule } from '#shared/types/signing'
import { INSPECTOR_STATEMENT, PERFORMER_STATEMENT, type SignatureCapacity } from '#shared/types/worksheet'
import type { H3Event } from 'h3'
import { Signature, User } from '../models'
import { contentHashOf, fieldDigests, signedRecordOf, signingPayload, type SignedRecordSource } from '#shared/utils/record-proof'
import { reauthenticate } from './sessions'

/**
 * Signatures on a worksheet: the signer as the database holds them now (never a cached name or
 * authorisation), the password re-entered, and one performer and one inspector signature per
 * round — the database's unique index refuses a second whatever the interleaving.
 */

const STATEMENT: Record<SignatureCapacity, string> = { performer: PERFORMER_STATEMENT, inspector: INSPECTOR_STATEMENT }

/** The signer as stored now; a disabled account cannot sign. */
export async function currentSigner(id: number): Promise<User> {
  const fresh = await User.findByPk(id)
  if (!fresh || fresh.disabled) {
    throw createError({
      status: 401,
      statusMessage: 'Unauthorized',
      message: 'Your account is no longer active; the signature was not made.',
    })
  }
  return fresh
}

/** The password re-entered to sign, counted like a sign-in (checked outside any write: it is slow on purpose). */
export function confirmSigner(event: H3Event, signer: User, password: string): Promise<void> {
  return reauthenticate(event, signer, password, {
    status: 401,
    message: 'That password is not right; the signature was not made.',
    field: 'password',
  })
}

/** How a signature was made and what it is over, as stored with it. */
export interface SignedAs {
  method: SignatureMethod
  payload: SigningPayload
  signedFields: Record<string, string>
  passkeyId: number | null
  assertion: SignatureAssertion | null
  /** The certifying authorisation it was made under, frozen. */
  authorisation: FrozenAuthorisation | null
}

function refusedProof(message: string, field: 'password' | 'passkey'): never {
  throw createError({
    status: 422,
    statusMessage: 'Unprocessable Entity',
    message,
    data: { field, issues: [{ path: [field], field, message }] },
  })
}

/** The method a signature is made with, as the organisation's rule allows; 422 naming the field otherwise. */
export function signingMethod(rule: SigningRule, proof: { password?: string, passkey?: unknown }): SignatureMethod {
  if (proof.passkey && proof.password) refusedProof('Sign with a passkey or a password, not both.', 'password')
  if (proof.passkey) {
    if (rule === 'password') refusedProof('Your organisation asks for your password to sign, not a passkey.', 'password')
    return 'passkey'
  }
  if (rule === 'passkey') {
    refusedProof(
      'Your organisation signs with a passkey: use this device\'s or your security key (register one on your Account page).',
      'passkey',
    )
  }
  if (!proof.password) refusedProof('Enter your password to sign.', 'password')
  return 'password'
}

/** What a signature in this capacity is over: the record's field digests and the payload a passkey signs. */
export function signingProof(
  record: SignedRecordSource,
  signer: Pick<User, 'id' | 'name' | 'authorisationNumber'>,
  capacity: SignatureCapacity,
): { payload: SigningPayload, signedFields: Record<string, string> } {
  const signedFields = fieldDigests(signedRecordOf(record))
  const payload = signingPayload({
    worksheetId: record.id,
    round: record.round,
    capacity,
    signer: { id: signer.id, name: signer.name, authorisationNumber: signer.authorisationNumber },
    statement: STATEMENT[capacity],
    contentHash: contentHashOf(signedFields),
  })
  return { payload, signedFields }
}

/** Writes one signature of a round, in the caller's transaction; a second for the same round and capacity is 409. */
export async function createSignature(
  worksheet: { id: number, round: number },
  signer: Pick<User, 'id' | 'name' | 'authorisationNumber'>,
  capacity: SignatureCapacity,
  signedAt: Date,
  transaction: Transaction,
  signedAs?: SignedAs,
): Promise<void> {
  try {
    await Signature.create(
      {
        worksheetId: worksheet.id,
        userId: signer.id,
        capacity,
        name: signer.name,
        authorisationNumber: signedAs?.authorisation?.number ?? signer.authorisationNumber,
        statement: STATEMENT[capacity],
        signedAt,
        round: worksheet.round,
        method: signedAs?.method ?? 'password',
        passkeyId: signedAs?.passkeyId ?? null,
        payload: signedAs?.payload ?? null,
        signedFields: signedAs?.signedFields ?? null,
        assertion: signedAs?.assertion ?? null,
        authorisation: signedAs?.authorisation ?? null,
      },
      { transaction },
    )
  }
  catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'This worksheet already carries that signature for this round; it was not signed twice.',
    })
  }
}
