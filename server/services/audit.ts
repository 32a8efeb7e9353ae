import type { AuditAcceptBody, AuditResolveHeadBody } from '#shared/schemas/audit'
import type { AuditVerifyAnswer } from '#shared/types/audit'
import {
  appendAudit,
  auditExportLines,
  auditSigningKey,
  reanchorHead,
  verifyAuditChain,
  type ExportPeriod,
} from '../database/audit-chain'
import { lastVouched, type HeldRecord } from '../database/record-guard'
import { recordHash } from '../database/record-hash'
import { syncAlert } from './unit-trends'
import type { User } from '../models'
import { mailIntegrityHold } from './notifications'

/**
 * The audit trail as administrators deal with it: the check, the signed export, and the two
 * deliberate acts that lift a hold — accepting a record's content as it now stands, and re-anchoring
 * the chain's head — each an audit entry with the administrator's reason.
 */

type Actor = Pick<User, 'id' | 'name' | 'email'>

export async function verifyTrail(): Promise<AuditVerifyAnswer> {
  return { ...(await verifyAuditChain()), signingKey: auditSigningKey() }
}

/**
 * The whole chain, or a period's run of it (from the first day's start to the end of the last, UTC), as signed
 * lines; refused (503) when no audit secret is configured to sign with.
 */
export function signedExport(actor: Actor, period?: { from: string, to: string }): AsyncGenerator<string> {
  if (!auditSigningKey()) {
    throw createError({
      status: 503,
      statusMessage: 'Service Unavailable',
      message: 'No audit secret is configured, so the export cannot be signed.',
    })
  }
  return auditExportLines(`${actor.name} <${actor.email}>`, period && exportPeriod(period))
}

/** A period of UTC calendar days, both included, as the instants it runs from and until. */
export function exportPeriod(period: { from: string, to: string }): ExportPeriod {
  const from = new Date(`${period.from}T00:00:00.000Z`)
  const until = new Date(new Date(`${period.to}T00:00:00.000Z`).getTime() + 86_400_000)
  return { from, until, label: { from: period.from, to: period.to } }
}

const subjectOf = (entity: string, entityId: string) => `integrity:${entity}:${entityId}`

/** A write was refused because a record changed outside Chargewell: one open alert; administrators mailed once. */
export async function recordHeld(held: HeldRecord): Promise<void> {
  await writeTransaction(async (transaction) => {
    const raised = await syncAlert('integrity', subjectOf(held.entity, held.entityId), true, held.reason, transaction)
    // Queued in the write that raised it: an alert is never raised without its mail.
    if (raised) await mailIntegrityHold(held)
  })
}

/** The record's current content becomes what the trail vouches for, with the administrator's reason. */
export async function acceptHeldRecord(actor: Actor, body: AuditAcceptBody): Promise<{ eventId: number }> {
  return writeTransaction(async (transaction) => {
    const id = Number(body.entityId)
    const current = await recordHash(body.entity, id, transaction)
    if (current === null) throw createError({ status: 404, message: `There is no ${body.entity} ${id}.` })
    const vouched = await lastVouched(body.entity, id, transaction)
    if (vouched?.recordHash === current)
      throw createError({
        status: 409,
        message: `${body.entity} ${id} matches its audit entry ${vouched.eventId}: there is nothing to accept.`,
      })
    const event = await appendAudit(
      {
        actorId: actor.id,
        entity: body.entity,
        entityId: body.entityId,
        action: 'integrity-accepted',
        detail: {
          reason: body.reason,
          vouchedEventId: vouched?.eventId ?? null,
          vouchedHash: vouched?.recordHash ?? null,
          acceptedHash: current,
        },
      },
      transaction,
      { trustCurrentContent: true },
    )
    await syncAlert('integrity', subjectOf(body.entity, body.entityId), false, '', transaction)
    return { eventId: event.id }
  })
}

/** The head is sealed again over the entries that are there; what was wrong is kept in the entry that says so. */
export async function resolveHead(actor: Actor, body: AuditResolveHeadBody): Promise<AuditVerifyAnswer> {
  const before = await verifyAuditChain()
  if (before.headProblems.length === 0 && !before.firstBroken)
    throw createError({ status: 409, message: 'The chain\'s head matches its entries: there is nothing to resolve.' })
  await writeTransaction(async (transaction) => {
    await reanchorHead(transaction)
    await appendAudit(
      {
        actorId: actor.id,
        entity: 'system',
        entityId: 'audit',
        action: 'head-resolved',
        detail: { reason: body.reason, problems: before.headProblems, firstBroken: before.firstBroken ?? null },
      },
      transaction,
    )
  })
  return verifyTrail()
}
