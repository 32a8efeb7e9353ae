import type { LoginBody } from '#shared/schemas/auth'
import type { PublicUser, SessionDto } from '#shared/types/user'

/** The signed-in user as the server holds them (authorisation number, preferences). */
export function useMe() {
  return useFetch<PublicUser>('/api/me', { key: 'me' })
}

/** The signed-in user's sessions, this device's marked `current`; ending one is read back from the server. */
export async function useMySessions() {
  const sessions = await useFetch<SessionDto[]>('/api/me/sessions', { key: 'my-sessions' })
  async function end(session: Pick<SessionDto, 'id'>) {
    await $fetch(`/api/me/sessions/${session.id}`, { method: 'DELETE' })
    await sessions.refresh()
  }
  async function endOthers() {
    await $fetch('/api/me/sessions/end-others', { method: 'POST' })
    await sessions.refresh()
  }
  return { ...sessions, end, endOthers }
}

/** Changes one's own password (the current one proves it); every other session ends. */
export function changePassword(currentPassword: string, newPassword: string) {
  return $fetch('/api/me/password', { method: 'POST', body: { currentPassword, newPassword } })
}

/** Signs in with e-mail and password and loads the session into the page. */
export async function startSession(body: LoginBody) {
  const session = useUserSession()
  await $fetch('/api/auth/login', { method: 'POST', body })
  await session.fetch()
}

/** Ends this device's session on the server and in the page. */
export async function endSession() {
  const session = useUserSession()
  await $fetch('/api/auth/logout', { method: 'POST' })
  await session.clear()
}
