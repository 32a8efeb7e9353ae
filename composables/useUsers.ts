import type { UserCreateBody } from '#shared/schemas/auth'
import type { PublicUser } from '#shared/types/user'

export type UserChanges = Partial<Pick<PublicUser, 'roles' | 'disabled' | 'authorisationNumber'>>

/** Every user, for the administrator. A change of role or a disabled account ends that user's sessions. */
export async function useUsers() {
  const users = await useFetch<PublicUser[]>('/api/admin/users', { key: 'admin-users' })
  async function update(user: PublicUser, changes: UserChanges) {
    await $fetch(`/api/admin/users/${user.id}`, { method: 'PATCH', body: changes })
    await users.refresh()
  }
  return { ...users, update }
}

/** Adds a user with their roles and a first password. */
export function addUser(body: UserCreateBody) {
  return $fetch<PublicUser>('/api/admin/users', { method: 'POST', body })
}

/** Sets a new password for a user (handed over in person); their sessions end. */
export function resetPassword(user: Pick<PublicUser, 'id'>, password: string) {
  return $fetch(`/api/admin/users/${user.id}/password`, { method: 'POST', body: { password } })
}
