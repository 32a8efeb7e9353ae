import { Op, UniqueConstraintError, type Transaction } from 'sequelize'
import type { AuthorisationCreateBody, AuthorisationUpdateBody } from '#shared/schemas/authorisation'
import type { AuthorisationDto, FrozenAuthorisation } from '#shared/types/authorisation'
import type { SignatureCapacity, WorksheetContent } from '#shared/types/worksheet'
import { can } from '#shared/abilities'
import { coveringAuthorisation, standingOf } from '#shared/utils/authorisation'
import { appendAudit } from '../database/audit-chain'
import { Authorisation, User } from '../models'
import { notFound } from './audited-writes'

/**
 * The register of certifying authorisations, and the check every signature passes: the signer holds
 * one that covers this unit (part number or aircraft type), this capacity and today at the station.
 */

export function toAuthorisationDto(row: Authorisation, today = stationToday()): AuthorisationDto {
  return {
    id: row.id,
    number: row.number,
    holder: { id: row.holderId, name: row.holder?.name ?? '' },
    privileges: row.privileges,
    scopeKind: row.scopeKind,
    scope: row.scope,
    issuedOn: row.issuedOn,
    expiresOn: row.expiresOn,
    issuingBody: row.issuingBody,
    suspendedAt: row.suspendedAt?.toISOString() ?? null,
    suspendedReason: row.suspendedReason,
    standing: standingOf(row, today),
  }
}

export function frozenAuthorisation(row: Authorisation): FrozenAuthorisation {
  const { id, number, privileges, scopeKind, scope, issuedOn, expiresOn, issuingBody } = row
  return { id, number, privileges, scopeKind, scope, issuedOn, expiresOn, issuingBody }
}

const WITH_HOLDER = [{ model: User, as: 'holder', attributes: ['id', 'name'] }]

export async function listAuthorisations(where: { holderId?: number } = {}): Promise<AuthorisationDto[]> {
  const rows = await Authorisation.findAll({ where, include: WITH_HOLDER, order: [['number', 'ASC']] })
  const today = stationToday()
  return rows.map(row => toAuthorisationDto(row, today))
}

async function audited(admin: Pick<User, 'id'>, row: Authorisation, action: string, detail: object, transaction: Transaction) {
  await appendAudit({ actorId: admin.id, entity: 'authorisation', entityId: String(row.id), action, detail: { number: row.number, ...detail } }, transaction)
}

export async function createAuthorisation(admin: Pick<User, 'id'>, body: AuthorisationCreateBody): Promise<AuthorisationDto> {
  const holder = await User.findByPk(body.holderId)
  if (!holder)
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'No such user to hold it.', data: { field: 'holderId' } })
  let created: Authorisation
  try {
    created = await writeTransaction(async (transaction) => {
      const row = await Authorisation.create({ ...body, suspendedAt: null, suspendedReason: null }, { transaction })
      await audited(admin, row, 'authorisation-issued', { holderId: body.holderId, terms: body }, transaction)
      return row
    })
  }
  catch (error) {
    if (!(error instanceof UniqueConstraintError)) throw error
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: `Authorisation ${body.number} is already in the register.`,
      data: { field: 'number', issues: [{ path: ['number'], field: 'number', message: `Authorisation ${body.number} is already in the register.` }] },
    })
  }
  void mailExpiringAuthorisations()
  return authorisationById(created.id)
}

export async function authorisationById(id: number): Promise<AuthorisationDto> {
  const row = await Authorisation.findByPk(id, { include: WITH_HOLDER })
  return row ? toAuthorisationDto(row) : notFound('Authorisation')
}

/** Changes its terms, suspends it (with a reason) or reinstates it; audited, in one write that signatures wait on. */
export async function changeAuthorisation(
  admin: Pick<User, 'id'>,
  id: number,
  change: { terms: AuthorisationUpdateBody } | { suspend: string } | { reinstate: true },
): Promise<AuthorisationDto> {
  await writeTransaction(async (transaction) => {
    const row = await Authorisation.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row) notFound('Authorisation')
    if ('terms' in change) {
      const from = Object.fromEntries(Object.keys(change.terms).map(key => [key, row.get(key)]))
      const renewed = change.terms.expiresOn && change.terms.expiresOn !== row.expiresOn
      await row.update({ ...change.terms, ...(renewed ? { expiryNoticeSentAt: null } : {}) }, { transaction })
      await audited(admin, row, 'authorisation-changed', { from, to: change.terms }, transaction)
    }
    else if ('suspend' in change) {
      await row.update({ suspendedAt: new Date(), suspendedReason: change.suspend }, { transaction })
      await audited(admin, row, 'authorisation-suspended', { reason: change.suspend }, transaction)
    }
    else if (row.suspendedAt) {
      await row.update({ suspendedAt: null, suspendedReason: null }, { transaction })
      await audited(admin, row, 'authorisation-reinstated', {}, transaction)
    }
  })
  void mailExpiringAuthorisations()
  return authorisationById(id)
}

/**
 * The signer's authorisation that covers this worksheet's unit in this capacity today, or 403 with the
 * reason in words. In a transaction the rows are locked, so a suspension and a signature are ordered:
 * one signed before the suspension counts, one after is refused.
 */
export async function authorisationToSign(
  signer: Pick<User, 'id'>,
  content: Pick<WorksheetContent, 'accumulator' | 'aircraft'>,
  capacity: SignatureCapacity,
  transaction?: Transaction,
): Promise<Authorisation> {
  const held = await Authorisation.findAll({
    where: { holderId: signer.id },
    order: [['id', 'ASC']],
    transaction,
    ...(transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  })
  const found = coveringAuthorisation(held, {
    partNumber: content.accumulator.partNumber,
    aircraftType: content.aircraft.type,
    today: stationToday(),
  }, capacity)
  if ('refusal' in found) {
    throw createError({
      status: 403,
      statusMessage: 'Forbidden',
      message: `${found.refusal} The signature was not made.`,
      data: { field: 'authorisation' },
    })
  }
  return found.authorisation
}

let mailing: Promise<void> | undefined
/** Holders and administrators are told 30 days before an authorisation expires (once per expiry date). */
export function mailExpiringAuthorisations(): Promise<void> {
  mailing ??= (async () => {
    const today = stationToday()
    const horizon = new Date(`${today}T12:00:00Z`)
    horizon.setUTCDate(horizon.getUTCDate() + 30)
    const expiring = await Authorisation.findAll({
      where: {
        suspendedAt: null,
        expiryNoticeSentAt: null,
        expiresOn: { [Op.gte]: today, [Op.lte]: horizon.toISOString().slice(0, 10) },
      },
      include: [{ model: User, as: 'holder' }],
    })
    if (!expiring.length) return
    const admins = (await User.findAll({ where: { disabled: false } })).filter(user => can(user.roles, 'user.manage'))
    for (const row of expiring) {
      const holder = row.holder!
      const recipients = [...new Set([holder.email, ...admins.map(admin => admin.email)])]
      for (const to of recipients) {
        await sendMail({
          to,
          kind: 'authorisation-expiring',
          subject: `Authorisation ${row.number} of ${holder.name} expires on ${row.expiresOn}`,
          text: `${holder.name}'s certifying authorisation ${row.number} (${row.issuingBody}) expires on ${row.expiresOn}. `
            + 'After that date Chargewell refuses signatures made under it. Renew it in the register (Admin → Certifying authorisations) '
            + 'once the issuing body has renewed it.\n\nThe approved maintenance data and local regulations govern.',
        })
      }
      await writeTransaction(transaction => row.update({ expiryNoticeSentAt: new Date() }, { transaction }))
    }
  })().finally(() => {
    mailing = undefined
  })
  return mailing
}
