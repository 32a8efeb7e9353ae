import type { Pressure, Temperature, Volume } from './types'

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

export function formatPressure(pressure: Pressure, significant = 4): string {
  const suffix = pressure.unit === 'psi' ? (pressure.basis === 'gauge' ? 'psig' : 'psia') : `${pressure.unit} ${pressure.basis === 'gauge' ? 'gauge' : 'abs'}`
  return `${formatNumber(pressure.value, significant)} ${suffix}`
}

export function formatTemperature(temperature: Temperature): string {
  return `${formatNumber(temperature.value, 3)} ${unitLabel(temperature.unit)}`
}

export function formatVolume(volume: Volume, significant = 4): string {
  return `${formatNumber(volume.value, significant)} ${unitLabel(volume.unit)}`
}
