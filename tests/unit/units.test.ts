import { describe, expect, it } from 'vitest'
import { ambientPressure, standardAtmospherePressure } from '../../shared/gas/atmosphere'
import {
  convertPressure, kelvinToTemperature, pascalAbsoluteToPressure, pressureToHectopascals, pressureToPascalAbsolute,
  stationPressureFromHectopascals, temperatureToKelvin, volumeToCubicMetres,
} from '../../shared/gas/units'

describe('conversion factors', () => {
  it('psi, bar, kPa, MPa', () => {
    // Source: NIST SP 811 (2008) App. B.9 — 1 psi = 6.894 757 E+03 Pa; 1 bar = 1.0 E+05 Pa (exact).
    expect(pressureToPascalAbsolute({ value: 1, unit: 'psi', basis: 'absolute' }, 0)).toBeCloseTo(6894.757, 3)
    expect(pressureToPascalAbsolute({ value: 1, unit: 'bar', basis: 'absolute' }, 0)).toBe(1e5)
    expect(convertPressure({ value: 3000, unit: 'psi', basis: 'gauge' }, 'bar').value).toBeCloseTo(206.843, 3)
  })

  it('volumes: the cubic inch from the inch, litres and cubic centimetres', () => {
    // Source: the international inch is 2.54 cm exactly (NIST SP 811 (2008) App. B.9), so 1 in³ = 2.54³ cm³;
    // 1 L = 1.0 E−03 m³, 1 cm³ = 1.0 E−06 m³ (exact).
    expect(volumeToCubicMetres({ value: 1, unit: 'in3' })).toBeCloseTo(2.54 ** 3 * 1e-6, 15)
    expect(volumeToCubicMetres({ value: 231, unit: 'in3' })).toBeCloseTo(3.785411784e-3, 12) // 1 US gallon = 231 in³ (NIST SP 811 App. B.9)
    expect(volumeToCubicMetres({ value: 1, unit: 'L' })).toBeCloseTo(1e-3, 12)
    expect(volumeToCubicMetres({ value: 1, unit: 'cm3' })).toBeCloseTo(1e-6, 14)
  })

  it('temperatures, from convert-units', () => {
    // Source: NIST SP 811 (2008) §4.2.1.1 and App. B.9 — T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8; °R = K × 1.8.
    expect(temperatureToKelvin({ value: 21, unit: 'C' })).toBeCloseTo(294.15, 10)
    expect(temperatureToKelvin({ value: 70, unit: 'F' })).toBeCloseTo((70 + 459.67) * 5 / 9, 10)
    expect(temperatureToKelvin({ value: 491.67, unit: 'R' })).toBeCloseTo(273.15, 10)
    expect(kelvinToTemperature(233.15, 'F').value).toBeCloseTo(-40, 10)
  })

  it('gauge and absolute', () => {
    const ambient = 101325
    const absolute = pressureToPascalAbsolute({ value: 1000, unit: 'psi', basis: 'gauge' }, ambient)
    expect(pascalAbsoluteToPressure(absolute, 'psi', 'absolute', ambient).value).toBeCloseTo(1014.696, 3)
    expect(pascalAbsoluteToPressure(absolute, 'psi', 'gauge', ambient).value).toBeCloseTo(1000, 10)
  })
})

describe('standard atmosphere', () => {
  // Source: U.S. Standard Atmosphere 1976 (NOAA/NASA/USAF), Table I, geopotential altitude.
  it.each([
    [0, 101325],
    [500, 95460.8],
    [1000, 89874.6],
    [2000, 79495.2],
    [3000, 70108.5],
    [5000, 54019.9],
  ])('at %i m is %f Pa', (metres, pascals) => {
    expect(standardAtmospherePressure(metres)).toBeCloseTo(pascals, -1)
  })

  it('accepts feet and a barometric reading, refuses nonsense', () => {
    expect(ambientPressure({ elevation: { value: 5000, unit: 'ft' } })).toBeCloseTo(standardAtmospherePressure(1524), 6)
    expect(ambientPressure({ pressure: { value: 98.2, unit: 'kPa', basis: 'absolute' } })).toBeCloseTo(98200, 6)
    expect(ambientPressure()).toBe(101325)
    expect(() => ambientPressure({ elevation: { value: 20000, unit: 'm' } })).toThrow(/outside the standard atmosphere/)
    expect(() => ambientPressure({ pressure: { value: 14.7, unit: 'psi', basis: 'gauge' } })).toThrow(/absolute/)
  })
})

describe('barometer readings', () => {
  it('hectopascals to the engine\'s ambient and back', async () => {
    // Source: NIST SP 811 (2008) App. B.9 — 1 hPa = 100 Pa; the standard atmosphere is 1013.25 hPa.
    expect(stationPressureFromHectopascals(1013.25)).toEqual({ value: 101.325, unit: 'kPa', basis: 'absolute' })
    expect(pressureToHectopascals({ value: 14.695949, unit: 'psi', basis: 'absolute' })).toBeCloseTo(1013.25, 2)
  })
})
