import type { H3Event } from 'h3'
import { Op } from 'sequelize'
import type { z } from 'zod'
import type { auditEventQuerySchema } from '#shared/schemas/audit'
import type { PasswordChangeBody, UserCreateBody, UserUpdateBody } from '#shared/schemas/auth'
import { DEFAULT_PREFERENCES, type UserPreferences } from '#shared/types/user'
import { describeAuditEvent, type AuditEventDto } from '#shared/utils/audit-words'
import { appendAudit } from '../database/audit-chain'
import { AuditEvent, Station, User, UserSession } from '../models'
import { endAllSessions, sessionsChangedAfterCommit } from '../utils/session-store'
import { unprocessable } from './audited-writes'
import { scopeOf } from './scope'
import { reauthenticate } from './sessions'

/**
 * Users as an administrator manages them. Every change is audited as what it is — roles
 * changed (from, to), disabled, enabled, details changed — so the audit view reads plainly; a
 * change of access ends the user's sessions in the same write.
 */

function notFound(): never {
  throw createError({ status: 404, statusMessage: 'Not Found', message: 'User not found.' })
}

export async function createUser(admin: User, body: UserCreateBody): Promise<User> {
  if (await User.findOne({ where: { email: body.email } })) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: `A user with the e-mail ${body.email} already exists.`,
      data: { issues: [{ path: ['email'], field: 'email', message: 'Already in use.' }] },
    })
  }
  const passwordHash = await hashPassword(body.password)
  return writeTransaction(async (transaction) => {
    const created = await User.create(
      {
        email: body.email,
        name: body.name,
        roles: body.roles,
        authorisationNumber: body.authorisationNumber ?? null,
        passwordHash,
        preferences: DEFAULT_PREFERENCES,
      },
      { transaction },
    )
    await appendAudit(
      {
        actorId: admin.id,
        entity: 'user',
        entityId: String(created.id),
        action: 'created',
        detail: { email: created.email, roles: created.roles },
      },
      transaction,
    )
    return created
  })
}

export async function updateUser(admin: User, id: number, body: UserUpdateBody): Promise<User> {
  const user = await User.findByPk(id)
  if (!user) notFound()
  // Separation of duties: nobody changes what they themselves may do or certify; another administrator must.
  const sameRoles = (roles: readonly string[]) => [...roles].sort().join(',') === [...user.roles].sort().join(',')
  const ownAuthority
    = (body.roles !== undefined && !sameRoles(body.roles))
      || (body.authorisationNumber !== undefined && body.authorisationNumber !== user.authorisationNumber)
  if (user.id === admin.id && (body.disabled === true || ownAuthority)) {
    throw createError({
      status: 403,
      statusMessage: 'Forbidden',
      message:
        'You cannot disable yourself or change your own roles or authorisation number: another administrator must, '
        + 'and the audit trail shows who did.',
    })
  }
  const before = {
    roles: [...user.roles].sort(),
    disabled: user.disabled,
    name: user.name,
    authorisationNumber: user.authorisationNumber,
  }
  await writeTransaction(async (transaction) => {
    await user.update(body, { transaction })
    const audit = (action: string, detail: Record<string, unknown>) =>
      appendAudit({ actorId: admin.id, entity: 'user', entityId: String(user.id), action, detail }, transaction)
    const roles = body.roles ? [...body.roles].sort() : before.roles
    if (roles.join(',') !== before.roles.join(',')) {
      await audit('roles-changed', { from: before.roles, to: roles })
      if (body.disabled !== true) await endAllSessions(user, 'roles-changed', transaction)
    }
    if (body.disabled === true && !before.disabled) {
      await audit('disabled', {})
      await endAllSessions(user, 'disabled', transaction)
    }
    // A re-enabled account starts afresh: its old sessions stay ended.
    if (body.disabled === false && before.disabled) await audit('enabled', {})
    const details = Object.fromEntries(
      (['name', 'authorisationNumber'] as const)
        .filter(field => body[field] !== undefined && body[field] !== before[field])
        .map(field => [field, { from: before[field], to: body[field] }]),
    )
    if (Object.keys(details).length) await audit('updated', { changes: details })
    // A new name or authorisation number is what the user's next request sees.
    sessionsChangedAfterCommit(user.id, transaction)
  })
  return user
}

/** Sets a new password (the admin hands it over; the user should change it); their sessions end. */
export async function resetPassword(admin: User, id: number, password: string): Promise<void> {
  const user = await User.findByPk(id)
  if (!user) notFound()
  const passwordHash = await hashPassword(password)
  await writeTransaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction })
    await endAllSessions(user, 'password-reset', transaction)
    await appendAudit(
      { actorId: admin.id, entity: 'user', entityId: String(user.id), action: 'password-reset', detail: {} },
      transaction,
    )
  })
}

export async function listUsers() {
  return (await User.findAll({ order: [['name', 'ASC']] })).map(user => user.toPublic())
}

/** The user's own display units and home station (one of the stations they may see). */
export async function savePreferences(user: User, preferences: UserPreferences) {
  const station = preferences.stationName.trim()
  if (station) {
    const scope = await scopeOf(user)
    const known = await Station.count({ where: { name: station } })
    if (!known || (scope.stations !== null && !scope.stations.includes(station))) {
      unprocessable(`“${station}” is not one of your stations: choose one you are granted, or none.`, 'stationName')
    }
  }
  await writeTransaction(async (transaction) => {
    await user.update({ preferences }, { transaction })
    sessionsChangedAfterCommit(user.id, transaction)
  })
  return user.toPublic()
}

/** The user's own password, the current one re-entered; their other sessions end, this one stays. */
export async function changeOwnPassword(user: User, body: PasswordChangeBody, event: H3Event): Promise<void> {
  await reauthenticate(event, user, body.currentPassword, {
    status: 422,
    message: 'That is not your current password; nothing was changed.',
    field: 'currentPassword',
  })
  const currentSessionId = event.context.sessionId as number | undefined
  const passwordHash = await hashPassword(body.newPassword)
  const current = currentSessionId ? await UserSession.findByPk(currentSessionId) : null
  await writeTransaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction })
    await endAllSessions(user, 'password-changed', transaction, current ?? undefined)
    await appendAudit(
      { actorId: user.id, entity: 'user', entityId: String(user.id), action: 'password-changed', detail: {} },
      transaction,
    )
  })
}

/** The audit trail in words, newest first, for the Admin page. */
export async function auditEvents(
  query: z.infer<typeof auditEventQuerySchema>,
): Promise<{ total: number, totalCapped: boolean, items: AuditEventDto[] }> {
  const { total, totalCapped, rows } = await pageOf(AuditEvent, {
    where: query.entity ? { entity: query.entity } : {},
    order: [['id', 'DESC']],
    page: query.page,
    pageSize: query.pageSize,
  })
  const ids = rows
    .flatMap(row => [row.actorId, row.entity === 'user' ? Number(row.entityId) : null])
    .filter((id): id is number => Number.isInteger(id))
  const nameOf = new Map(
    (await User.findAll({ where: { id: { [Op.in]: [...new Set(ids)] } }, attributes: ['id', 'name'] })).map(person => [
      person.id,
      person.name,
    ]),
  )
  return {
    total,
    totalCapped,
    items: rows.map(row => ({
      id: row.id,
      at: row.at.toISOString(),
      actor: row.actorId ? (nameOf.get(row.actorId) ?? `user ${row.actorId}`) : null,
      entity: row.entity,
      entityId: row.entityId,
      action: row.action,
      text: describeAuditEvent(row, row.entity === 'user' ? nameOf.get(Number(row.entityId)) : null),
      requestId: row.requestId ?? null,
    })),
  }
}
