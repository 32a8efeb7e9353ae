import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto'
import type { H3Event } from 'h3'
import {
  generateAuthenticationOptions,
  generateRegistrationOptions,
  verifyAuthenticationResponse,
  verifyRegistrationResponse,
} from '@simplewebauthn/server'
import type { AuthenticationResponseJSON, RegistrationResponseJSON } from '@simplewebauthn/types'
import type { Transaction } from 'sequelize'
import type { PasskeyDto, SignatureAssertion, SigningPayload } from '#shared/types/signing'
import { appendAudit } from '../database/audit-chain'
import { Passkey, type User } from '../models'
import { notFound, unprocessable } from './audited-writes'

/**
 * Each user's signing credentials (WebAuthn passkeys): the tablet's own authenticator or a
 * security key that stays with the person (USB or NFC). The register keeps every public key with
 * its registration and revocation times and never deletes one.
 */

const REGISTRATION_MINUTES = 5

/**
 * The relying party is the address users open Chargewell at (NUXT_PUBLIC_URL): a passkey answer made on
 * any other page is refused. Where loopback addresses are allowed (the demo and the tests on one
 * machine), a browser on localhost is its own relying party: WebAuthn takes no IP address.
 */
export function relyingParty(event: H3Event): { rpID: string, origin: string } {
  const requested = requestedURL(event).origin
  const loopbackAllowed = import.meta.dev || String(useRuntimeConfig().allowLoopbackLabels) === 'true'
  const origin = loopbackAllowed && isLoopbackAddress(requested) ? requested : publicAddress(event)
  return { rpID: new URL(origin).hostname, origin }
}

export function toPasskeyDto(passkey: Passkey): PasskeyDto {
  return {
    id: passkey.id,
    name: passkey.name,
    credentialId: passkey.credentialId,
    fingerprint: keyFingerprint(passkey.publicKey),
    transports: passkey.transports ?? [],
    registeredAt: passkey.registeredAt.toISOString(),
    revokedAt: passkey.revokedAt?.toISOString() ?? null,
    lastUsedAt: passkey.lastUsedAt?.toISOString() ?? null,
  }
}

export async function passkeysOf(userId: number): Promise<PasskeyDto[]> {
  const rows = await Passkey.findAll({ where: { userId }, order: [['registeredAt', 'DESC'], ['id', 'DESC']] })
  return rows.map(toPasskeyDto)
}

/** A registration's challenge, sealed for this user for five minutes: nothing is kept between the two requests. */
function seal(fields: { userId: number, challenge: string, expires: number }): string {
  const body = Buffer.from(JSON.stringify(fields)).toString('base64url')
  const mac = createHmac('sha256', String(useRuntimeConfig().session.password)).update(`passkey:${body}`).digest('base64url')
  return `${body}.${mac}`
}

function unseal(ticket: string, userId: number): string {
  const [body = '', mac = ''] = ticket.split('.')
  const expected = createHmac('sha256', String(useRuntimeConfig().session.password)).update(`passkey:${body}`).digest()
  const given = Buffer.from(mac, 'base64url')
  const fields = (() => {
    try {
      return JSON.parse(Buffer.from(body, 'base64url').toString('utf8')) as { userId: number, challenge: string, expires: number }
    }
    catch {
      return null
    }
  })()
  if (!fields || given.length !== expected.length || !timingSafeEqual(given, expected) || fields.userId !== userId)
    unprocessable('This registration was not started here; start it again.', 'ticket')
  if (fields.expires < Date.now()) unprocessable('This registration took longer than five minutes; start it again.', 'ticket')
  return fields.challenge
}

/** Options for the browser to create a passkey, and the sealed ticket to send back with its answer. */
export async function registrationOptions(event: H3Event, user: User) {
  const { rpID } = relyingParty(event)
  const existing = await Passkey.findAll({ where: { userId: user.id, revokedAt: null } })
  const options = await generateRegistrationOptions({
    rpName: 'Chargewell',
    rpID,
    userName: user.email,
    userDisplayName: user.name,
    userID: new TextEncoder().encode(`chargewell-user-${user.id}`),
    challenge: randomBytes(32),
    attestationType: 'none',
    excludeCredentials: existing.map(passkey => ({
      id: passkey.credentialId,
      transports: passkey.transports as never,
    })),
    // A key that stays with the person (USB, NFC) or the device's own authenticator: both first-class.
    authenticatorSelection: { residentKey: 'preferred', userVerification: 'preferred' },
    supportedAlgorithmIDs: [-7, -257],
  })
  const expires = Date.now() + REGISTRATION_MINUTES * 60_000
  return { options, ticket: seal({ userId: user.id, challenge: options.challenge, expires }) }
}

/** Registers the passkey the browser created, audited. */
export async function registerPasskey(
  event: H3Event,
  user: User,
  body: { name: string, ticket: string, response: RegistrationResponseJSON },
): Promise<PasskeyDto> {
  const challenge = unseal(body.ticket, user.id)
  const { rpID, origin } = relyingParty(event)
  let verification
  try {
    verification = await verifyRegistrationResponse({
      response: body.response,
      expectedChallenge: challenge,
      expectedOrigin: origin,
      expectedRPID: rpID,
      requireUserVerification: false,
    })
  }
  catch (error) {
    unprocessable(`The passkey could not be checked: ${(error as Error).message}`, 'response')
  }
  if (!verification.verified || !verification.registrationInfo) unprocessable('The passkey could not be checked.', 'response')
  const { credential } = verification.registrationInfo
  if (await Passkey.findOne({ where: { credentialId: credential.id } }))
    throw createError({ status: 409, statusMessage: 'Conflict', message: 'That passkey is already registered.', data: { field: 'response' } })
  const passkey = await writeTransaction(async (transaction) => {
    const created = await Passkey.create({
      userId: user.id,
      credentialId: credential.id,
      publicKey: Buffer.from(credential.publicKey).toString('base64url'),
      counter: credential.counter,
      transports: credential.transports ?? body.response.response.transports ?? [],
      name: body.name,
      registeredAt: new Date(),
      revokedAt: null,
      lastUsedAt: null,
    }, { transaction })
    await appendAudit({
      actorId: user.id,
      entity: 'passkey',
      entityId: String(created.id),
      action: 'passkey-registered',
      detail: {
        userId: user.id,
        name: body.name,
        fingerprint: keyFingerprint(created.publicKey),
        publicKey: created.publicKey,
      },
    }, transaction)
    return created
  })
  return toPasskeyDto(passkey)
}

/**
 * Revokes one of `holderId`'s passkeys (the actor's own, or an administrator's for a lost key): it never
 * signs again, and still verifies what it signed before. Revoking twice keeps the first time.
 */
export async function revokePasskey(actor: User, id: number, holderId = actor.id): Promise<PasskeyDto> {
  return writeTransaction(async (transaction) => {
    const passkey = await Passkey.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!passkey || passkey.userId !== holderId) notFound('Passkey')
    if (!passkey.revokedAt) {
      await passkey.update({ revokedAt: new Date() }, { transaction })
      await appendAudit({
        actorId: actor.id,
        entity: 'passkey',
        entityId: String(passkey.id),
        action: 'passkey-revoked',
        detail: { userId: passkey.userId, name: passkey.name, fingerprint: keyFingerprint(passkey.publicKey) },
      }, transaction)
    }
    return toPasskeyDto(passkey)
  })
}

/** Request options for signing: the challenge is derived from what is signed, so nothing is kept between requests. */
export async function signingRequestOptions(event: H3Event, userId: number, challenge: string) {
  const keys = await Passkey.findAll({ where: { userId, revokedAt: null } })
  if (!keys.length) return null
  const options = await generateAuthenticationOptions({
    rpID: relyingParty(event).rpID,
    challenge: Buffer.from(challenge, 'base64url'),
    allowCredentials: keys.map(passkey => ({ id: passkey.credentialId, transports: passkey.transports as never })),
    userVerification: 'preferred',
  })
  return options as unknown as Record<string, unknown>
}

/**
 * Checks a signing assertion: made by one of the signer's passkeys not revoked, over exactly this
 * payload (the challenge is its hash), at this address. Answers the passkey and the assertion to store.
 */
export async function verifySigningAssertion(
  event: H3Event,
  signer: User,
  response: AuthenticationResponseJSON,
  payload: SigningPayload,
  transaction: Transaction,
): Promise<{ passkey: Passkey, assertion: SignatureAssertion }> {
  const passkey = await Passkey.findOne({
    where: { credentialId: response.id },
    transaction,
    lock: transaction.LOCK.UPDATE,
  })
  const refuse = (message: string): never => {
    throw createError({ status: 401, statusMessage: 'Unauthorized', message, data: { field: 'passkey' } })
  }
  if (!passkey || passkey.userId !== signer.id) refuse('That passkey is not registered to you; the signature was not made.')
  if (passkey!.revokedAt) refuse(`The passkey “${passkey!.name}” was revoked; it cannot sign. The signature was not made.`)
  const { rpID, origin } = relyingParty(event)
  const challenge = challengeOf(payload)
  let verification
  try {
    verification = await verifyAuthenticationResponse({
      response,
      expectedChallenge: challenge,
      expectedOrigin: origin,
      expectedRPID: rpID,
      credential: { id: passkey!.credentialId, publicKey: Buffer.from(passkey!.publicKey, 'base64url'), counter: Number(passkey!.counter) },
      requireUserVerification: false,
    })
  }
  catch (error) {
    const message = (error as Error).message
    if (/challenge/i.test(message))
      throw createError({
        status: 409,
        statusMessage: 'Conflict',
        message: 'The worksheet changed after the passkey was asked to sign it; the signature was not made. Check it again and sign.',
      })
    refuse(`The passkey's answer could not be verified (${message}); the signature was not made.`)
  }
  if (!verification!.verified) refuse('The passkey\'s answer could not be verified; the signature was not made.')
  const counter = verification!.authenticationInfo.newCounter
  await passkey!.update({ counter, lastUsedAt: new Date() }, { transaction })
  return {
    passkey: passkey!,
    assertion: {
      credentialId: response.id,
      authenticatorData: response.response.authenticatorData,
      clientDataJSON: response.response.clientDataJSON,
      signature: response.response.signature,
      ...(response.response.userHandle ? { userHandle: response.response.userHandle } : {}),
    },
  }
}
