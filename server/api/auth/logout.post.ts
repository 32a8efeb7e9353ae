import { endSession, hasSessionCookie, liveSession, SessionEnded } from '../../services/sessions'

/** Signs out: the session ends on the server, so the old cookie no longer works. Harmless without one. */
export default defineEventHandler(async (event) => {
  if (!hasSessionCookie(event)) return { signedOut: true }
  const live = await liveSession(event).catch((error) => {
    if (error instanceof SessionEnded) return null
    throw error
  })
  if (live) await endSession(live.session.id, 'signed-out')
  await clearUserSession(event)
  return { signedOut: true }
})
