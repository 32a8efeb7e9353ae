import type { PressureUnit } from '../gas/types'

interface GaugeFigures {
  accuracy: number | null
  accuracyUnit: PressureUnit | '%FS' | null
  rangeMax: number | null
  rangeUnit: PressureUnit | null
}

/** A gauge's accuracy as ± in a pressure unit; "%FS" is a share of full scale (the range maximum). */
export function gaugeAccuracy(gauge: GaugeFigures): { value: number, unit: PressureUnit } | undefined {
  if (gauge.accuracy === null || !gauge.accuracyUnit) return undefined
  if (gauge.accuracyUnit !== '%FS') return { value: gauge.accuracy, unit: gauge.accuracyUnit }
  if (gauge.rangeMax === null || !gauge.rangeUnit) return undefined
  return { value: gauge.accuracy / 100 * gauge.rangeMax, unit: gauge.rangeUnit }
}
