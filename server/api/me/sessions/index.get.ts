import type { SessionDto } from '../../../../shared/types/user'
import { openSessions } from '../../../services/sessions'

/** The devices the user is signed in on, this one marked. */
export default defineEventHandler(async (event): Promise<SessionDto[]> => {
  const user = await requireRole(event)
  return (await openSessions(user.id)).map(session => ({
    id: session.id,
    current: session.id === event.context.sessionId,
    userAgent: session.userAgent,
    address: session.address,
    signedInAt: session.createdAt.toISOString(),
    lastSeenAt: session.lastSeenAt.toISOString(),
  }))
})
