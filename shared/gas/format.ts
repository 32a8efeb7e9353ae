import type { Pressure, PressureBasis, PressureUnit, Temperature, Volume } from './types'

const UNIT_LABEL: Record<string, string> = { in3: 'in³', cm3: 'cm³', m3: 'm³', L: 'L', C: '°C', F: '°F', K: 'K', R: '°R' }

/**
 * The station's locale for figures (NUXT_PUBLIC_LOCALE, set once at start on the server and in the
 * browser): its decimal separator, never a thousands separator, so "1001.8" stands beside "1455.0"
 * and a figure reads the same in a field, a table, a message and the PDF.
 */
let stationLocale = 'en-GB'
export function setStationLocale(locale: string): void {
  stationLocale = locale
}
export function getStationLocale(): string {
  return stationLocale
}

const figureFormats = new Map<string, Intl.NumberFormat>()
/** A figure with `decimals` places (or up to them, with `trim`), in the locale, without grouping. */
export function formatDecimalValue(value: number, decimals: number, locale = stationLocale, trim = false): string {
  if (!Number.isFinite(value)) return '—'
  const key = `${locale}|${decimals}|${trim}`
  let format = figureFormats.get(key)
  if (!format) {
    format = new Intl.NumberFormat(locale, {
      minimumFractionDigits: trim ? 0 : decimals,
      maximumFractionDigits: decimals,
      useGrouping: false,
    })
    figureFormats.set(key, format)
  }
  // −0.0 is 0.0.
  return format.format(Object.is(value, -0) ? 0 : value).replace(/^-(?=0([.,]0*)?$)/, '')
}

/** A figure with a sensible number of decimals for a person reading a gauge or a table. */
export function formatNumber(value: number, significant = 4): string {
  if (!Number.isFinite(value)) return '—'
  const magnitude = Math.abs(value)
  const decimals = magnitude === 0 ? 0 : Math.max(0, Math.min(6, significant - 1 - Math.floor(Math.log10(magnitude))))
  return formatDecimalValue(value, decimals)
}

export function unitLabel(unit: string): string {
  return UNIT_LABEL[unit] ?? unit
}

/** A flow rate as the engine answers it ({ value, unit: "in3/min" }): "1.33 in³/min". */
export function formatFlowRate(rate: { value: number, unit: string }, decimals = 2): string {
  const [volume, per] = rate.unit.split('/')
  return `${formatDecimalValue(rate.value, decimals)} ${unitLabel(volume ?? '')}${per ? `/${per}` : ''}`
}

/** Decimals shown per pressure unit: finer than any charging gauge resolves, no finer. */
const PRESSURE_DECIMALS: Record<PressureUnit, number> = { psi: 1, bar: 2, kPa: 0, MPa: 3 }

export function formatPressureValue(value: number, unit: PressureUnit): string {
  return formatDecimalValue(value, PRESSURE_DECIMALS[unit])
}

/** psig / psia, or "bar gauge" / "bar abs"; without a basis (a difference), the bare unit. */
export function pressureUnitLabel(unit: PressureUnit, basis?: PressureBasis): string {
  if (!basis) return unit
  if (unit === 'psi') return basis === 'gauge' ? 'psig' : 'psia'
  return `${unit} ${basis === 'gauge' ? 'gauge' : 'abs'}`
}

export function formatPressure(pressure: Pressure): string {
  return `${formatPressureValue(pressure.value, pressure.unit)} ${pressureUnitLabel(pressure.unit, pressure.basis)}`
}

/** A temperature to a tenth of a degree, whatever its size (100.4 °F stays 100.4 °F). */
export function formatTemperature(temperature: Temperature): string {
  return `${formatDecimalValue(temperature.value, 1)} ${unitLabel(temperature.unit)}`
}

export function formatVolume(volume: Volume, significant = 4): string {
  return `${formatNumber(volume.value, significant)} ${unitLabel(volume.unit)}`
}
