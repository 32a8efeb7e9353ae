import { idParamsSchema, passwordResetSchema } from '../../../../../shared/schemas/auth'
import { appendAudit } from '../../../../database/audit-chain'
import { User } from '../../../../models'
import { endAllSessions } from '../../../../services/sessions'

/** Sets a new password for a user (the admin hands it over; the user should change it); their sessions end. */
export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(passwordResetSchema))
  const user = await User.findByPk(id)
  if (!user) throw createError({ status: 404, message: 'User not found.' })
  const passwordHash = await hashPassword(password)
  await writeTransaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction })
    await endAllSessions(user, 'password-reset', transaction)
    await appendAudit({ actorId: admin.id, entity: 'user', entityId: String(user.id), action: 'password-reset', detail: {} }, transaction)
  })
  return { reset: true }
})
