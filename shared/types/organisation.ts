/** A station as the API gives it. */
export interface StationDto {
  id: number
  name: string
  code: string
  timeZone: string
  elevation: { value: number, unit: 'ft' | 'm' }
}

/** An operator (owner of aircraft) as the API gives it. */
export interface OperatorDto {
  id: number
  name: string
  code: string
  /** The organisation's own fleet. */
  own: boolean
}

/** What a user may see: the stations and operators granted, by name, for the pages to say. */
export interface ScopeDto {
  /** Sees every station and operator (administrators, and users granted everything). */
  whole: boolean
  stations: StationDto[]
  operators: OperatorDto[]
  /** Stations: every one (no station grant). */
  everyStation: boolean
  /** Operators: every one (no operator grant). */
  everyOperator: boolean
}
