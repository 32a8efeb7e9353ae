import { Op } from 'sequelize'
import type { WorksheetContent } from '#shared/types/worksheet'
import { can } from '#shared/abilities'
import type { HeldRecord } from '../database/record-guard'
import type { AlertChange } from './unit-trends'
import { Notification, User, type Worksheet } from '../models'
import { alertsWithinScope, scopeOf, seesAircraft } from './scope'
import { announceAlerts } from './webhooks'

/**
 * Every e-mail Chargewell sends, worded once: the countersign request, the return to the
 * performer, trend alerts. Sent after the write that caused them committed; each is kept in
 * the outbox (sent or failed) by sendMail.
 */

const GOVERNS = 'The approved maintenance data and local regulations govern.'
const link = (path: string) => `${publicAddress()}${path}`
const activeUsers = (except?: number) =>
  User.findAll({ where: { disabled: false, ...(except ? { id: { [Op.ne]: except } } : {}) } })

function unitOf(worksheet: Worksheet): string {
  const content = worksheet.content as WorksheetContent
  return `${content.aircraft.registration}, ${content.accumulator.position}`
}

/** The performer signed: every other inspector is asked to countersign. */
export async function askForCountersign(worksheet: Worksheet, performer: Pick<User, 'id' | 'name'>): Promise<void> {
  const content = worksheet.content as WorksheetContent
  // Only inspectors who may see the aircraft are asked (server/services/scope.ts).
  const inspectors = []
  for (const user of await activeUsers(performer.id)) {
    if (can(user.roles, 'worksheet.inspect') && seesAircraft(await scopeOf(user), worksheet.aircraftId)) inspectors.push(user)
  }
  await Promise.all(
    inspectors.map(inspector =>
      sendMail({
        to: inspector.email,
        kind: 'awaiting-countersign',
        worksheetId: worksheet.id,
        subject: `Worksheet ${worksheet.id} awaits countersign — ${unitOf(worksheet)}`,
        text:
          `${performer.name} signed worksheet ${worksheet.id} (work order ${worksheet.workOrder}) for ${unitOf(worksheet)}, `
          + `P/N ${content.accumulator.partNumber} S/N ${content.accumulator.serialNumber}.\n\n`
          + `It awaits independent inspection: ${link(`/worksheets/${worksheet.id}`)}\n\n${GOVERNS}`,
      }),
    ),
  )
}

/** The inspector returned the work: the performer is told why. */
export async function tellReturned(worksheet: Worksheet, inspector: Pick<User, 'name'>, reason: string): Promise<void> {
  const performer = await User.findByPk(worksheet.performerId)
  if (!performer) return
  await sendMail({
    to: performer.email,
    kind: 'returned',
    worksheetId: worksheet.id,
    subject: `Worksheet ${worksheet.id} returned — ${unitOf(worksheet)}`,
    text:
      `${inspector.name} returned worksheet ${worksheet.id} (work order ${worksheet.workOrder}) to you.\n\nReason: ${reason}\n\n`
      + `Correct it and sign again: ${link(`/worksheets/${worksheet.id}`)}`,
  })
}

/** One e-mail to every engineer per newly raised trend alert (who may see its aircraft), and its webhook. */
export async function mailAlerts(changes: AlertChange[]): Promise<void> {
  if (changes.length === 0) return
  // The systems that follow the trends hear of it by webhook, in the same write.
  await announceAlerts(changes)
  const engineers = (await activeUsers()).filter(user => can(user.roles, 'specification.manage'))
  const scopes = new Map(
    await Promise.all(engineers.map(async engineer => [engineer.id, await scopeOf(engineer)] as const)),
  )
  for (const change of changes) {
    const { kind, message } = change
    // Each engineer is told of the alerts on what they may see.
    const told = []
    for (const engineer of engineers) {
      if ((await alertsWithinScope(scopes.get(engineer.id)!, [change])).length) told.push(engineer)
    }
    await Promise.all(
      told.map(engineer =>
        sendMail({
          to: engineer.email,
          kind: `trend-${kind}`,
          subject: `Trend alert: ${message.slice(0, 90)}`,
          text: `${message}\n\nSee ${link('/trends')}\n\n${GOVERNS}`,
        }),
      ),
    )
  }
}

/** A write was refused because a record changed outside Chargewell: every administrator is told, once per hold. */
export async function mailIntegrityHold(held: HeldRecord): Promise<void> {
  const admins = (await activeUsers()).filter(user => can(user.roles, 'audit.verify'))
  await Promise.all(
    admins.map(admin =>
      sendMail({
        to: admin.email,
        kind: 'integrity-hold',
        subject: `Record held: ${held.entity} ${held.entityId} changed outside Chargewell`,
        text:
          `${held.reason}\n\nChargewell refused a write to it and holds it until an administrator has checked it. `
          + `Compare it with the paper record or a backup, then accept its content with your reason, or restore it: `
          + `${link('/admin')}`,
      }),
    ),
  )
}

/** An administrator sends a message that was given up on again; 409 when it is not one. */
export async function retryFailedMail(id: number): Promise<{ queued: true }> {
  if (await retryMail(id)) return { queued: true }
  throw createError({ status: 409, message: 'Only an e-mail that was given up on (failed) can be sent again.' })
}

/** The outbox: what Chargewell sent (or failed to send), and what the local fake SMTP server received. */
export async function outbox(): Promise<OutboxDto> {
  const notifications = await Notification.findAll({ order: [['id', 'DESC']], limit: 200 })
  return {
    fakeSmtp: useRuntimeConfig().fakeSmtp === 'fake',
    notifications: notifications.map(message => ({
      id: message.id,
      recipient: message.recipient,
      subject: message.subject,
      body: message.body,
      kind: message.kind,
      status: message.status,
      error: message.error,
      createdAt: message.createdAt.toISOString(),
      attempts: message.attempts,
      nextAttemptAt: message.nextAttemptAt?.toISOString() ?? null,
      lastAttemptAt: message.lastAttemptAt?.toISOString() ?? null,
    })),
    received: fakeInbox(),
  }
}
