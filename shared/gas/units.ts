import convert from 'convert-units'
import type {
  Elevation,
  Interval,
  IntervalUnit,
  Pressure,
  PressureBasis,
  PressureUnit,
  Temperature,
  TemperatureUnit,
  Volume,
  VolumeUnit,
} from './types'

/**
 * Pascals per unit. psi from NIST SP 811 (2008) App. B.9: 1 lbf/in² = 6.894 757 E+03 Pa; the
 * full figure 6894.757293168 follows from the exact pound-force and inch definitions.
 */
export const PASCALS_PER: Record<PressureUnit, number> = {
  psi: 6894.757293168,
  bar: 1e5,
  kPa: 1e3,
  MPa: 1e6,
}

/** Standard atmosphere at sea level, Pa (ICAO Doc 7488 / US Standard Atmosphere 1976). */
export const STANDARD_ATMOSPHERE_PA = 101325

// convert-units supplies the metric volume and the temperature relations; they are linear, so
// the scale and offset are read from it once and conversions stay cheap in tight loops.
// Its cubic inch (via the US gallon) is 4.6 ppm off the exact 16.387064 cm³, so that one is
// the exact figure (NIST SP 811 (2008) App. B.9: 1 in³ = 1.638 706 4 E−05 m³, exact).
const cubicMetresPer: Record<VolumeUnit, number> = {
  in3: 1.6387064e-5,
  L: convert(1).from('l').to('m3'),
  cm3: convert(1).from('cm3').to('m3'),
  m3: 1,
}

const kelvinLine = Object.fromEntries(
  (['C', 'F', 'K', 'R'] as TemperatureUnit[]).map((unit) => {
    const offset = convert(0).from(unit).to('K')
    return [unit, { offset, scale: convert(1).from(unit).to('K') - offset }]
  }),
) as Record<TemperatureUnit, { offset: number, scale: number }>

export function pressureToPascalAbsolute(pressure: Pressure, ambientPa: number): number {
  const pascals = pressure.value * PASCALS_PER[pressure.unit]
  return pressure.basis === 'gauge' ? pascals + ambientPa : pascals
}

export function pascalAbsoluteToPressure(
  pascals: number,
  unit: PressureUnit,
  basis: PressureBasis,
  ambientPa: number,
): Pressure {
  const shown = basis === 'gauge' ? pascals - ambientPa : pascals
  return { value: shown / PASCALS_PER[unit], unit, basis }
}

/** A pressure difference (a tolerance, a drop) has no basis. */
export function pressureDifferenceToPascal(value: number, unit: PressureUnit): number {
  return value * PASCALS_PER[unit]
}

export function temperatureToKelvin(temperature: Temperature): number {
  const line = kelvinLine[temperature.unit]
  return temperature.value * line.scale + line.offset
}

export function kelvinToTemperature(kelvin: number, unit: TemperatureUnit): Temperature {
  const line = kelvinLine[unit]
  return { value: (kelvin - line.offset) / line.scale, unit }
}

export function volumeToCubicMetres(volume: Volume): number {
  return volume.value * cubicMetresPer[volume.unit]
}

export function cubicMetresToVolume(cubicMetres: number, unit: VolumeUnit): Volume {
  return { value: cubicMetres / cubicMetresPer[unit], unit }
}

export function elevationToMetres(elevation: Elevation): number {
  return elevation.unit === 'ft' ? elevation.value * 0.3048 : elevation.value
}

const SECONDS_PER: Record<IntervalUnit, number> = { s: 1, min: 60, h: 3600 }

export function intervalToSeconds(interval: Interval): number {
  return interval.value * SECONDS_PER[interval.unit]
}

export function secondsToInterval(seconds: number, unit: IntervalUnit): Interval {
  return { value: seconds / SECONDS_PER[unit], unit }
}

/** The same pressure in another unit, keeping its basis (no ambient pressure needed). */
export function convertPressure(pressure: Pressure, unit: PressureUnit): Pressure {
  return { value: (pressure.value * PASCALS_PER[pressure.unit]) / PASCALS_PER[unit], unit, basis: pressure.basis }
}

/** A pressure difference (tolerance, accuracy) in another unit. */
export function convertPressureDifference(value: number, from: PressureUnit, to: PressureUnit): number {
  return (value * PASCALS_PER[from]) / PASCALS_PER[to]
}

/** A temperature in another unit. */
export function convertTemperature(temperature: Temperature, unit: TemperatureUnit): Temperature {
  return kelvinToTemperature(temperatureToKelvin(temperature), unit)
}

/** A barometer reading in hectopascals (QFE) as the engine's absolute ambient pressure; 1 hPa = 100 Pa. */
export function stationPressureFromHectopascals(hectopascals: number): Pressure {
  return { value: (hectopascals * 100) / PASCALS_PER.kPa, unit: 'kPa', basis: 'absolute' }
}

/** An absolute pressure as a barometer reading in hectopascals. */
export function pressureToHectopascals(pressure: Pressure): number {
  return (pressure.value * PASCALS_PER[pressure.unit]) / 100
}
