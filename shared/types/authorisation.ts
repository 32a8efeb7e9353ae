/** What a certifying authorisation lets its holder do: perform the work, inspect it, or both. */
export type AuthorisationPrivileges = 'perform' | 'inspect' | 'both'
export const AUTHORISATION_PRIVILEGES = ['perform', 'inspect', 'both'] as const
export const PRIVILEGE_LABELS: Record<AuthorisationPrivileges, string> = {
  perform: 'Perform and sign',
  inspect: 'Inspect and countersign',
  both: 'Perform and inspect',
}

/** An authorisation's scope names part numbers (a family such as FA-2260 covers FA-2260-02) or aircraft types. */
export type AuthorisationScopeKind = 'part-numbers' | 'aircraft-types'

export interface AuthorisationDto {
  id: number
  number: string
  holder: { id: number, name: string }
  privileges: AuthorisationPrivileges
  scopeKind: AuthorisationScopeKind
  scope: string[]
  /** Calendar dates at the station (YYYY-MM-DD). */
  issuedOn: string
  expiresOn: string
  issuingBody: string
  suspendedAt: string | null
  suspendedReason: string | null
  /** valid, expired, suspended or not yet valid, at the station today. */
  standing: 'valid' | 'expired' | 'suspended' | 'not-yet-valid'
}

/** What a signature froze of the authorisation it was made under. */
export type FrozenAuthorisation = Pick<
  AuthorisationDto,
  'id' | 'number' | 'privileges' | 'scopeKind' | 'scope' | 'issuedOn' | 'expiresOn' | 'issuingBody'
>
