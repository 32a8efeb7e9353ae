/**
 * One quantity input (shared/utils/quantity-entry.ts): what a person types is read in their locale,
 * empty is empty, a unit change converts, the range is checked in the unit on screen, and the figure
 * a page shows is the engine's answer for the inputs as they are shown.
 */
import { describe, expect, it } from 'vitest'
import { chargeTarget } from '../../shared/gas/charge-target'
import { convertPressure } from '../../shared/gas/units'
import {
  convertEntry, entryValue, formatEntry, parseEntry, rangeProblem, type QuantityKind, type QuantityUnit,
} from '../../shared/utils/quantity-entry'

const number = (value: number) => ({ state: 'number', value })

describe('reading what was typed', () => {
  it('takes a comma or a point as the decimal separator, in en-GB and de-DE alike', () => {
    for (const locale of ['en-GB', 'de-DE', 'fr-FR']) {
      expect(parseEntry('2,5', locale)).toEqual(number(2.5))
      expect(parseEntry('2.5', locale)).toEqual(number(2.5))
      expect(parseEntry('-2,5', locale)).toEqual(number(-2.5))
      expect(parseEntry('−12,25', locale)).toEqual(number(-12.25))
      expect(parseEntry(' 1455 ', locale)).toEqual(number(1455))
      expect(parseEntry(',5', locale)).toEqual(number(0.5))
      expect(parseEntry('0,125', locale)).toEqual(number(0.125))
    }
  })

  it('treats empty as empty, never zero', () => {
    expect(parseEntry('', 'en-GB')).toEqual({ state: 'empty' })
    expect(parseEntry('   ', 'de-DE')).toEqual({ state: 'empty' })
  })

  it('refuses what could be read two ways, with a plain message', () => {
    expect(parseEntry('1,234.5', 'en-GB')).toMatchObject({ state: 'invalid', message: expect.stringMatching(/without a thousands separator/) })
    expect(parseEntry('1.234,5', 'de-DE')).toMatchObject({ state: 'invalid' })
    expect(parseEntry('1,234,567', 'en-GB')).toMatchObject({ state: 'invalid' })
    // A single separator and three digits: a thousands separator in that locale, a decimal in the other.
    expect(parseEntry('1,234', 'en-GB')).toMatchObject({ state: 'invalid', message: expect.stringMatching(/1234 or 1\.234/) })
    expect(parseEntry('1,234', 'de-DE')).toEqual(number(1.234))
    expect(parseEntry('1.234', 'de-DE')).toMatchObject({ state: 'invalid' })
    expect(parseEntry('1.234', 'en-GB')).toEqual(number(1.234))
    expect(parseEntry('12a', 'en-GB')).toMatchObject({ state: 'invalid' })
    expect(parseEntry('1e3', 'en-GB')).toMatchObject({ state: 'invalid' })
  })
})

describe('units and ranges', () => {
  it('converts the physical value when the unit changes, and back again', () => {
    // 1 psi = 6894.757 Pa (NIST SP 811, appendix B.8), so 1000 psi = 68.948 bar.
    expect(convertEntry(1000, 'pressure', 'psi', 'bar')).toBeCloseTo(68.94757, 4)
    expect(convertEntry(convertEntry(1000, 'pressure', 'psi', 'bar'), 'pressure', 'bar', 'psi')).toBeCloseTo(1000, 9)
    expect(convertEntry(50, 'temperature', 'C', 'F')).toBeCloseTo(122, 9)
    expect(convertEntry(100, 'volume', 'in3', 'L')).toBeCloseTo(1.6387064, 6)
    expect(convertEntry(1000, 'elevation', 'ft', 'm')).toBeCloseTo(304.8, 9)
  })

  it('refuses a reading above the unit\'s maximum in the unit on screen, with the limit in its own unit', () => {
    const max = { value: 3000, unit: 'psi' as const, reason: 'the unit\'s maximum working pressure' }
    expect(rangeProblem(1000, 'pressure', 'bar', 'en-GB', { max }, 'gauge'))
      .toBe('Above the unit\'s maximum working pressure, 206.84 bar gauge (3000 psig): check the figure and the unit.')
    expect(rangeProblem(68.95, 'pressure', 'bar', 'en-GB', { max }, 'gauge')).toBeNull()
  })

  it('writes a figure back in the station locale, with the quantity\'s decimals and no grouping', () => {
    expect(formatEntry(68.94757, 'pressure', 'bar', 'en-GB')).toBe('68.95')
    expect(formatEntry(2.5, 'temperature', 'C', 'de-DE')).toBe('2,5')
    expect(formatEntry(1455, 'pressure', 'psi', 'en-GB')).toBe('1455')
    expect(formatEntry(12345.67, 'pressure', 'psi', 'en-GB')).toBe('12345.7')
    expect(formatEntry(undefined, 'pressure', 'psi', 'en-GB')).toBe('')
  })
})

describe('the figure shown is the engine\'s answer for the inputs on screen (property)', () => {
  // A seeded generator keeps the property test repeatable.
  let seed = 7
  const uniform = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648
    return seed / 2147483648
  }
  const pick = <T>(items: readonly T[]) => items[Math.floor(uniform() * items.length)]!

  it('what a field holds reads back from what it shows, in every unit and locale', () => {
    const cases: [QuantityKind, QuantityUnit[], number, number][] = [
      ['pressure', ['psi', 'bar', 'kPa', 'MPa'], 0, 5000],
      ['temperature', ['C', 'F', 'K'], -60, 90],
      ['volume', ['in3', 'L', 'cm3'], 0.1, 2000],
      ['duration', ['s', 'min', 'h'], 0, 600],
    ]
    for (let trial = 0; trial < 2000; trial++) {
      const [kind, units, low, high] = pick(cases)
      const unit = pick(units)
      const locale = pick(['en-GB', 'de-DE', 'en-US', 'fr-FR'])
      const held = entryValue(low + uniform() * (high - low), kind, unit)
      const shown = formatEntry(held, kind, unit, locale)
      expect(parseEntry(shown, locale), `${held} ${unit} in ${locale} shown as ${shown}`).toEqual(number(held))
    }
  })

  it('after any chain of gauge-unit switches the target is the engine\'s for the temperature and readings shown', () => {
    const units = ['psi', 'bar', 'kPa', 'MPa'] as const
    for (let trial = 0; trial < 300; trial++) {
      let unit: (typeof units)[number] = 'psi'
      const start = entryValue(500 + uniform() * 2500, 'pressure', unit)
      let reference = start
      const gas = entryValue(-40 + uniform() * 100, 'temperature', 'C')
      for (let switches = 0; switches < 4; switches++) {
        const next = pick(units)
        reference = entryValue(convertEntry(reference, 'pressure', unit, next), 'pressure', next)
        unit = next
      }
      const onScreen = Number(formatEntry(reference, 'pressure', unit, 'en-GB'))
      const request = (value: number) => ({
        reference: { pressure: { value, unit, basis: 'gauge' as const }, temperature: { value: 21, unit: 'C' as const } },
        gasTemperature: { value: gas, unit: 'C' as const },
      })
      expect(chargeTarget(request(reference)).target.value).toBe(chargeTarget(request(onScreen)).target.value)
      // The switches kept the physical value to the rounding of the units shown (at worst half of 1 kPa, 0.073 psi,
      // per switch).
      expect(Math.abs(convertPressure({ value: reference, unit, basis: 'gauge' }, 'psi').value - start)).toBeLessThan(0.3)
    }
  })
})
