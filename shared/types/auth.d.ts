import type { Role } from './user'

declare module '#auth-utils' {
  interface User {
    id: number
    name: string
    email: string
    roles: Role[]
  }
}

export {}
