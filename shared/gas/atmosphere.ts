import { EngineInputError } from './errors'
import type { Ambient } from './types'
import { elevationToMetres, pressureToPascalAbsolute, STANDARD_ATMOSPHERE_PA } from './units'

/** Lowest and highest field elevations accepted, m: the troposphere of the standard atmosphere. */
export const ELEVATION_RANGE_M = { min: -610, max: 11000 } as const

/**
 * Pressure of the standard atmosphere at a geopotential altitude in the troposphere,
 * p = 101325 · (1 − 2.25577·10⁻⁵ · h)^5.25588 Pa (ICAO Doc 7488; US Standard Atmosphere 1976,
 * lapse rate 6.5 K/km from 288.15 K).
 */
export function standardAtmospherePressure(elevationMetres: number): number {
  if (!(elevationMetres >= ELEVATION_RANGE_M.min && elevationMetres <= ELEVATION_RANGE_M.max)) {
    throw new EngineInputError(
      `Field elevation ${Math.round(elevationMetres)} m is outside the standard atmosphere used here (${ELEVATION_RANGE_M.min} m to ${ELEVATION_RANGE_M.max} m).`,
      'ambient.elevation',
    )
  }
  return STANDARD_ATMOSPHERE_PA * Math.pow(1 - 2.25577e-5 * elevationMetres, 5.25588)
}

/**
 * Local atmospheric pressure (Pa absolute) from a barometric reading, an elevation, or neither (sea level
 * standard).
 */
export function ambientPressure(ambient?: Ambient): number {
  if (!ambient) return STANDARD_ATMOSPHERE_PA
  if ('pressure' in ambient) {
    const pascals = pressureToPascalAbsolute(ambient.pressure, 0)
    if (ambient.pressure.basis !== 'absolute' || !(pascals > 30000 && pascals < 120000)) {
      throw new EngineInputError(
        'A barometric reading must be an absolute pressure between 300 and 1200 hPa.',
        'ambient.pressure',
      )
    }
    return pascals
  }
  return standardAtmospherePressure(elevationToMetres(ambient.elevation))
}

export function describeAmbient(ambient?: Ambient): string {
  if (!ambient) return 'standard sea-level atmosphere (101.325 kPa)'
  if ('pressure' in ambient) return `barometric reading ${ambient.pressure.value} ${ambient.pressure.unit}`
  return `standard atmosphere at ${ambient.elevation.value} ${ambient.elevation.unit} elevation`
}
