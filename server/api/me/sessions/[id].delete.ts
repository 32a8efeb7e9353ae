import { idParamsSchema } from '../../../../shared/schemas/auth'
import { UserSession } from '../../../models'
import { endSession } from '../../../services/sessions'

/** Ends one of the user's own sessions (a device left signed in). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const session = await UserSession.findOne({ where: { id, userId: user.id } })
  if (!session) throw createError({ status: 404, statusMessage: 'Not Found', message: 'No such session of yours.' })
  await endSession(session.id, id === event.context.sessionId ? 'signed-out' : 'ended-by-user')
  if (id === event.context.sessionId) await clearUserSession(event)
  return { ended: true }
})
