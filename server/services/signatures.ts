import { UniqueConstraintError, type Transaction } from 'sequelize'
import { INSPECTOR_STATEMENT, PERFORMER_STATEMENT, type SignatureCapacity } from '#shared/types/worksheet'
import type { H3Event } from 'h3'
import { Signature, User } from '../models'
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

/** Writes one signature of a round, in the caller's transaction; a second for the same round and capacity is 409. */
export async function createSignature(
  worksheet: { id: number, round: number },
  signer: Pick<User, 'id' | 'name' | 'authorisationNumber'>,
  capacity: SignatureCapacity,
  signedAt: Date,
  transaction: Transaction,
): Promise<void> {
  try {
    await Signature.create(
      {
        worksheetId: worksheet.id,
        userId: signer.id,
        capacity,
        name: signer.name,
        authorisationNumber: signer.authorisationNumber,
        statement: STATEMENT[capacity],
        signedAt,
        round: worksheet.round,
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
