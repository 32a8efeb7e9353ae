import type { PressureUnit, TemperatureUnit } from '../gas/types'

export const ROLES = ['technician', 'inspector', 'engineer', 'admin'] as const
export type Role = (typeof ROLES)[number]

export const ROLE_LABELS: Record<Role, string> = {
  technician: 'Technician',
  inspector: 'Inspector',
  engineer: 'Engineer',
  admin: 'Administrator',
}

/** Display units a user chose, and the elevation of their home station. */
export interface UserPreferences {
  pressureUnit: PressureUnit
  temperatureUnit: Extract<TemperatureUnit, 'C' | 'F'>
  volumeUnit: 'in3' | 'L'
  stationElevation: { value: number, unit: 'm' | 'ft' }
  stationName: string
}

export const DEFAULT_PREFERENCES: UserPreferences = {
  pressureUnit: 'psi',
  temperatureUnit: 'C',
  volumeUnit: 'in3',
  stationElevation: { value: 0, unit: 'ft' },
  stationName: '',
}

export interface PublicUser {
  id: number
  email: string
  name: string
  roles: Role[]
  authorisationNumber: string | null
  disabled: boolean
  preferences: UserPreferences
  /** Stations (ids) the user may see; null: every station. */
  stationIds: number[] | null
  /** Operators (ids) the user may see; null: every operator. */
  operatorIds: number[] | null
}

/** One device the user is signed in on (`GET /api/me/sessions`). */
export interface SessionDto {
  id: number
  /** The session making this request. */
  current: boolean
  userAgent: string | null
  address: string | null
  signedInAt: string
  lastSeenAt: string
}
