import { liveSession, SessionEnded } from '../utils/session-store'

/**
 * `/api/_auth/session` (nuxt-auth-utils) answers from the sealed cookie alone. Here it checks
 * the session on the server as every route does, and answers with the name and roles as they
 * are now, not as they were at sign-in; an ended session is cleared and answers signed-out.
 */
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    try {
      const live = await liveSession(event)
      if (live) session.user = sessionUser(live.user)
    }
    catch (error) {
      if (!(error instanceof SessionEnded)) throw error
      await clearUserSession(event)
      for (const key of Object.keys(session)) Reflect.deleteProperty(session, key)
    }
  })
})
