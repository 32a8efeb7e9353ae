import { hasSessionCookie } from '../utils/session-store'

/**
 * Anonymous requests create no session. The session endpoint of nuxt-auth-utils (also asked
 * during server rendering) would otherwise open, and set a cookie for, an empty session for
 * every visitor: without a cookie there is nothing to look up, so it answers empty at once.
 */
export default defineEventHandler((event) => {
  if (event.path.startsWith('/api/_auth/session') && event.method === 'GET' && !hasSessionCookie(event)) return {}
})
