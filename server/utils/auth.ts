import type { H3Event } from 'h3'
import { can, refusal, type Ability } from '#shared/abilities'
import type { Role } from '#shared/types/user'
import type { User } from '../models'
import { liveSession, SessionEnded } from './session-store'

function unauthorised(message: string) {
  return createError({ status: 401, statusMessage: 'Unauthorized', message })
}

/**
 * The one gate every route passes first: 401 without a live session (none, signed out, ended
 * by a password or role change, or a user since disabled), 403 when the user holds none of
 * `roles` (no roles: any signed-in user). The session row and the roles are read from the
 * database, so a change by an admin takes effect at once. A request without a session cookie
 * is refused without one being made.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  let live
  try {
    live = await liveSession(event)
  }
  catch (error) {
    if (!(error instanceof SessionEnded)) throw error
    await clearUserSession(event)
    throw unauthorised(error.message)
  }
  if (!live) throw unauthorised('Please sign in first.')
  event.context.sessionId = live.session.id
  const { user } = live
  if (roles.length > 0 && !user.roles.some(role => roles.includes(role))) {
    throw createError({ status: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role.` })
  }
  return user
}

export function sessionUser(user: User) {
  return { id: user.id, name: user.name, email: user.email, roles: user.roles }
}

/**
 * The gate by ability (shared/abilities.ts): 401 without a live session (or a live API token), 403 when
 * the user's roles do not hold the ability, with the roles that do in the message — or when the token's
 * scopes do not.
 */
export async function requireAbility(event: H3Event, ability: Ability = 'account.own'): Promise<User> {
  // Another system, with an API token (server/services/api-tokens.ts): the token's scopes, then the user's roles.
  const { bearerOf, userOfToken } = await import('../services/api-tokens')
  const token = bearerOf(event)
  const user = token ? await userOfToken(event, token, ability) : await requireRole(event)
  if (!can(user.roles, ability)) throw createError({ status: 403, statusMessage: 'Forbidden', message: refusal(ability) })
  return user
}

/**
 * `requireAbility`, and what the user may see (server/services/scope.ts): every route that reads or
 * writes records of aircraft passes the scope to its service.
 */
export async function requireScope(event: H3Event, ability: Ability = 'account.own') {
  const user = await requireAbility(event, ability)
  const { scopeOf } = await import('../services/scope')
  return { user, scope: await scopeOf(user) }
}
