import type { Ability } from '../abilities'

/**
 * What a token may be used for, each scope a set of abilities (shared/abilities.ts). A token does what its
 * user's roles allow AND its scopes name: never more than the user.
 */
export const TOKEN_SCOPES = {
  'calculations': { label: 'Run calculations', abilities: ['calculation.run'] },
  'read-records': {
    label: 'Read records (registers, worksheets, trends, cycle checks, studies)',
    abilities: ['register.read', 'worksheet.read', 'trend.read', 'cycle-check.read', 'study.read'],
  },
  'write-cycle-checks': { label: 'Record pump-cycle checks', abilities: ['cycle-check.record'] },
  'import-registers': { label: 'Import registers (CSV)', abilities: ['fleet.manage', 'tool.manage', 'specification.manage'] },
} as const satisfies Record<string, { label: string, abilities: readonly Ability[] }>

export type TokenScope = keyof typeof TOKEN_SCOPES

export interface ApiTokenDto {
  id: number
  userId: number
  userName: string
  name: string
  prefix: string
  scopes: TokenScope[]
  expiresAt: string
  revokedAt: string | null
  lastUsedAt: string | null
  createdAt: string
  /** Usable now: neither revoked nor expired. */
  live: boolean
}
