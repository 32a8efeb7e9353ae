import { UserSession } from '../../../models'
import { endAllSessions } from '../../../services/sessions'

/** "Sign out everywhere else": every session of the user but this one ends. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const current = await UserSession.findByPk(event.context.sessionId)
  await writeTransaction(transaction => endAllSessions(user, 'signed-out-everywhere', transaction, current ?? undefined))
  return { ended: true }
})
