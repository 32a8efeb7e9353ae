import type { H3Event } from 'h3'
import type { Role } from '../../shared/types/user'
import { User } from '../models'

/**
 * The one gate every route passes first: 401 without a session (or for a user since
 * disabled), 403 when the user holds none of `roles` (no roles: any signed-in user).
 * Roles are read from the database, so a change by an admin takes effect at once.
 */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<User> {
  const session = await getUserSession(event)
  if (!session.user) throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'Please sign in first.' })
  await useDB()
  const user = await User.findByPk(session.user.id)
  if (!user || user.disabled) {
    await clearUserSession(event)
    throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'Your account is no longer active. Please sign in again or ask an administrator.' })
  }
  if (roles.length > 0 && !user.roles.some(role => roles.includes(role))) {
    throw createError({ status: 403, statusMessage: 'Forbidden', message: `This needs the ${roles.join(' or ')} role.` })
  }
  return user
}

export function sessionUser(user: User) {
  return { id: user.id, name: user.name, email: user.email, roles: user.roles }
}
