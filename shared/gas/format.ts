import type { Pressure, PressureBasis, PressureUnit, Temperature, Volume } from './types'

const UNIT_LABEL: Record<string, string> = { in3: 'in³', cm3: 'cm³', m3: 'm³', L: 'L', C: '°C', F: '°F', K: 'K', R: '°R' }

/** A figure with a sensible number of decimals for a person reading a gauge or a table. */
export function formatNumber(value: number, significant = 4): string {
  if (!Number.isFinite(value)) return '—'
  const magnitude = Math.abs(value)
  const decimals = magnitude === 0 ? 0 : Math.max(0, Math.min(6, significant - 1 - Math.floor(Math.log10(magnitude))))
  return value.toFixed(decimals)
}

export function unitLabel(unit: string): string {
  return UNIT_LABEL[unit] ?? unit
}

/** Decimals shown per pressure unit: finer than any charging gauge resolves, no finer. */
const PRESSURE_DECIMALS: Record<PressureUnit, number> = { psi: 1, bar: 2, kPa: 0, MPa: 3 }

export function formatPressureValue(value: number, unit: PressureUnit): string {
  return Number.isFinite(value) ? value.toFixed(PRESSURE_DECIMALS[unit]) : '—'
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
  return `${Number.isFinite(temperature.value) ? temperature.value.toFixed(1) : '—'} ${unitLabel(temperature.unit)}`
}

export function formatVolume(volume: Volume, significant = 4): string {
  return `${formatNumber(volume.value, significant)} ${unitLabel(volume.unit)}`
}
