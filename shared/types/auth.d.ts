import type { Role } from './user'

declare module '#auth-utils' {
  interface User {
    id: number
    name: string
    email: string
    roles: Role[]
  }
  interface UserSession {
    /** Names the server-side session row (user_sessions.token); see server/services/sessions.ts. */
    token?: string
    loggedInAt?: string
  }
}

export {}
