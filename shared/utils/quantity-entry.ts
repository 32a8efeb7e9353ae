/**
 * One way to enter a quantity (pressure, temperature, volume, time, elevation, a plain number):
 * the text a person types is read in their locale, kept with its unit, converted — never
 * reinterpreted — when the unit changes, checked against its range in the unit on screen, and
 * shown back with one rounding rule per quantity. Pure, so the pages and the tests share it.
 */
import { formatDecimalValue, unitLabel, pressureUnitLabel } from '../gas/format'
import type { ElevationUnit, IntervalUnit, PressureBasis, PressureUnit, TemperatureUnit, VolumeUnit } from '../gas/types'
import {
  convertPressureDifference, convertTemperature, cubicMetresToVolume, elevationToMetres, intervalToSeconds,
  secondsToInterval, volumeToCubicMetres,
} from '../gas/units'

export type QuantityKind = 'pressure' | 'temperature' | 'volume' | 'duration' | 'elevation' | 'number'
export type QuantityUnit = PressureUnit | TemperatureUnit | VolumeUnit | IntervalUnit | ElevationUnit | '%' | 'hPa' | ''

/** Decimals shown per quantity and unit: finer than the instrument that gives it, no finer. */
const DECIMALS: Record<string, number> = {
  'pressure:psi': 1, 'pressure:bar': 2, 'pressure:kPa': 0, 'pressure:MPa': 3, 'pressure:hPa': 1,
  'temperature:C': 1, 'temperature:F': 1, 'temperature:K': 1, 'temperature:R': 1,
  'volume:in3': 2, 'volume:L': 3, 'volume:cm3': 1, 'volume:m3': 6,
  'duration:s': 0, 'duration:min': 1, 'duration:h': 2,
  'elevation:m': 0, 'elevation:ft': 0,
}

/** The decimals a quantity is shown with in a unit (the one rounding rule). */
export function decimalsFor(kind: QuantityKind, unit: QuantityUnit, fallback = 2): number {
  return DECIMALS[`${kind}:${unit}`] ?? fallback
}

/** The decimal and grouping separators of a locale ("2,5" in de-DE, "2.5" in en-GB). */
export function separatorsOf(locale: string): { decimal: string, group: string } {
  const parts = new Intl.NumberFormat(locale, { useGrouping: true }).formatToParts(12345.6)
  return {
    decimal: parts.find(part => part.type === 'decimal')?.value ?? '.',
    group: parts.find(part => part.type === 'group')?.value ?? ',',
  }
}

export type ParsedEntry = { state: 'empty' } | { state: 'number', value: number } | { state: 'invalid', message: string }

/**
 * Reads what a person typed. Either a point or a comma is a decimal separator ("2,5" is 2.5 in any
 * locale: a group of thousands has three digits). Refused, with a plain message: a number with both
 * (1,234.5), more than one separator (1.234.567), and a single separator followed by exactly three
 * digits where it is the locale's thousands separator (1,234 in en-GB; 1.234 in de-DE), since it
 * could be read two ways. A minus may be "-" or "−"; spaces around are ignored; empty is empty.
 */
export function parseEntry(text: string, locale: string): ParsedEntry {
  const trimmed = text.replace(/[\s\u00A0\u202F]+/g, '')
  if (trimmed === '') return { state: 'empty' }
  const normalised = trimmed.replace(/^[−–]/, '-').replace(/^\+/, '')
  if (!/^-?(\d+([.,]\d*)?|[.,]\d+)$/.test(normalised)) {
    if (/^-?\d{1,3}([.,]\d{3})+([.,]\d+)?$/.test(normalised)) {
      return { state: 'invalid', message: 'Write the number without a thousands separator, e.g. 1234.5.' }
    }
    return { state: 'invalid', message: 'Enter a number (digits, one decimal point or comma, and a minus sign if below zero).' }
  }
  const separator = /[.,]/.exec(normalised)?.[0]
  if (separator) {
    const after = normalised.split(separator)[1]!
    const before = normalised.split(separator)[0]!.replace('-', '')
    if (after.length === 3 && before.length >= 1 && before !== '0' && separator === separatorsOf(locale).group) {
      const whole = normalised.replace(separator, '')
      const decimal = normalised.replace(separator, '.')
      return {
        state: 'invalid',
        message: `Is that ${whole} or ${decimal}? Write it without a thousands separator (${whole}) or with more decimals.`,
      }
    }
  }
  const value = Number(normalised.replace(',', '.'))
  return Number.isFinite(value) ? { state: 'number', value } : { state: 'invalid', message: 'Enter a number.' }
}

/**
 * The value a field holds for a number: rounded to what the field shows, so the figure computed from it is the
 * figure for the input on screen (parseEntry(formatEntry(v)) === entryValue(v)).
 */
export function entryValue(value: number, kind: QuantityKind, unit: QuantityUnit, decimals?: number): number {
  if (!Number.isFinite(value)) return value
  const rounded = Number(value.toFixed(decimals ?? decimalsFor(kind, unit)))
  return Object.is(rounded, -0) ? 0 : rounded
}

/** A value written for the field, in the locale and with the quantity's decimals (no thousands separator). */
export function formatEntry(
  value: number | undefined, kind: QuantityKind, unit: QuantityUnit, locale: string, decimals?: number,
): string {
  if (value === undefined || !Number.isFinite(value)) return ''
  const places = decimals ?? decimalsFor(kind, unit)
  // Trailing zeros are dropped in a field: "2.5", not "2.50".
  const rounded = Number(value.toFixed(places))
  return formatDecimalValue(rounded, places, locale, true)
}

/** The same quantity in another unit of its kind (a pressure keeps its basis; a difference has none). */
export function convertEntry(value: number, kind: QuantityKind, from: QuantityUnit, to: QuantityUnit): number {
  if (from === to || !from || !to) return value
  switch (kind) {
    case 'pressure':
      if (from === 'hPa' || to === 'hPa') return value
      return convertPressureDifference(value, from as PressureUnit, to as PressureUnit)
    case 'temperature':
      return convertTemperature({ value, unit: from as TemperatureUnit }, to as TemperatureUnit).value
    case 'volume':
      return cubicMetresToVolume(volumeToCubicMetres({ value, unit: from as VolumeUnit }), to as VolumeUnit).value
    case 'duration':
      return secondsToInterval(intervalToSeconds({ value, unit: from as IntervalUnit }), to as IntervalUnit).value
    case 'elevation': {
      const metres = elevationToMetres({ value, unit: from as ElevationUnit })
      return to === 'm' ? metres : metres / elevationToMetres({ value: 1, unit: to as ElevationUnit })
    }
    default:
      return value
  }
}

/** A limit of a field, in any unit of its kind, with the reason a person reads ("the unit's maximum pressure"). */
export interface QuantityLimit {
  value: number
  unit: QuantityUnit
  /** Included (≥, ≤) unless `exclusive`. */
  exclusive?: boolean
  reason?: string
  /** What to do instead of "check the figure and the unit" (e.g. depressurise and read again). */
  advice?: string
}

/** The unit as shown beside a figure: psig, bar gauge, °C, in³. */
export function quantityUnitLabel(kind: QuantityKind, unit: QuantityUnit, basis?: PressureBasis): string {
  if (kind === 'pressure' && unit !== 'hPa' && unit !== '') return pressureUnitLabel(unit as PressureUnit, basis)
  return unitLabel(unit)
}

/** The advice on a reading above the unit's maximum working pressure: the gauge shows system pressure. */
export const SYSTEM_PRESSURE
  = 'that is system pressure, not the pre-charge. Depressurise the hydraulic system and read again.'

/** Why a value is outside its range, in the unit on screen (and the limit's own unit beside it), or null. */
export function rangeProblem(
  value: number,
  kind: QuantityKind,
  unit: QuantityUnit,
  locale: string,
  limits: { min?: QuantityLimit, max?: QuantityLimit },
  basis?: PressureBasis,
): string | null {
  const label = quantityUnitLabel(kind, unit, basis)
  const describe = (limit: QuantityLimit, inUnit: number) => {
    const here = `${formatEntry(inUnit, kind, unit, locale)} ${label}`
    const own = limit.unit !== unit ? ` (${formatEntry(limit.value, kind, limit.unit, locale)} ${quantityUnitLabel(kind, limit.unit, basis)})` : ''
    return `${here}${own}`
  }
  if (limits.max) {
    const max = convertEntry(limits.max.value, kind, limits.max.unit, unit)
    if (limits.max.exclusive ? value >= max : value > max) {
      const advice = limits.max.advice ?? 'check the figure and the unit.'
      return `Above ${limits.max.reason ?? 'the highest value this field takes'}, ${describe(limits.max, max)}: ${advice}`
    }
  }
  if (limits.min) {
    const min = convertEntry(limits.min.value, kind, limits.min.unit, unit)
    if (limits.min.exclusive ? value <= min : value < min) {
      return `${limits.min.exclusive ? 'Must be above' : 'Below'} ${limits.min.reason ?? 'the lowest value this field takes'}, ${describe(limits.min, min)}: check the figure and the unit.`
    }
  }
  return null
}
