import { passwordChangeSchema } from '../../../shared/schemas/auth'
import { appendAudit } from '../../database/audit-chain'
import { UserSession } from '../../models'
import { endAllSessions } from '../../services/sessions'

/** Changes the user's own password (the current one re-entered); their other sessions end, this one stays. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { currentPassword, newPassword } = await readValidatedBody(event, validateWith(passwordChangeSchema))
  if (!(await checkPassword(user.passwordHash, currentPassword))) {
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'That is not your current password; nothing was changed.', data: { issues: [{ path: ['currentPassword'], field: 'currentPassword', message: 'Not your current password.' }] } })
  }
  const passwordHash = await hashPassword(newPassword)
  const current = await UserSession.findByPk(event.context.sessionId)
  await writeTransaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction })
    await endAllSessions(user, 'password-changed', transaction, current ?? undefined)
    await appendAudit({ actorId: user.id, entity: 'user', entityId: String(user.id), action: 'password-changed', detail: {} }, transaction)
  })
  return { changed: true }
})
