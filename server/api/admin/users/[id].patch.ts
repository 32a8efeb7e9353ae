import { idParamsSchema, userUpdateSchema } from '../../../../shared/schemas/auth'
import { appendAudit } from '../../../database/audit-chain'
import { User } from '../../../models'
import { endAllSessions, sessionsChangedAfterCommit } from '../../../services/sessions'

/** Name, roles, authorisation number, enable/disable. An admin cannot lock themselves out. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(userUpdateSchema))
  const user = await User.findByPk(id)
  if (!user) throw createError({ status: 404, message: 'User not found.' })
  if (user.id === admin.id && (body.disabled === true || (body.roles && !body.roles.includes('admin')))) {
    throw createError({ status: 422, message: 'You cannot disable yourself or remove your own admin role; ask another administrator.' })
  }
  const before = { roles: [...user.roles].sort().join(','), disabled: user.disabled }
  await writeTransaction(async (transaction) => {
    await user.update(body, { transaction })
    // Access that changed ends every session the user has; a re-enabled account starts afresh.
    const rolesChanged = body.roles !== undefined && [...body.roles].sort().join(',') !== before.roles
    if (body.disabled === true && !before.disabled) await endAllSessions(user, 'disabled', transaction)
    else if (rolesChanged) await endAllSessions(user, 'roles-changed', transaction)
    await appendAudit({ actorId: admin.id, entity: 'user', entityId: String(user.id), action: 'updated', detail: { changes: body } }, transaction)
    // A new name or authorisation number is what the user's next request sees.
    sessionsChangedAfterCommit(user.id, transaction)
  })
  return user.toPublic()
})
