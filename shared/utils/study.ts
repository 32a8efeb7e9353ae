import { EngineInputError } from '../gas/errors'
import {
  compressionRatioWarnings, dischargeCurve, prechargeSweep, requiredVolume, usableVolume,
  type DischargeCurveResult, type PrechargeSweepResult, type UsableVolumeResult,
} from '../gas/usable-volume'
import type { Volume } from '../gas/types'
import { ENGINE_VERSION } from '../gas/version'
import type { StudyInput } from '../schemas/study'

export interface StudyRow {
  label: string
  temperature: StudyInput['envelope'][number]['temperature']
  result?: UsableVolumeResult
  curve?: Pick<DischargeCurveResult, 'delivered' | 'pressure' | 'applications'>
  sweep?: Pick<PrechargeSweepResult, 'precharge' | 'usable' | 'optimum'>
  required?: { gasVolume: Volume, applications?: number }
  /** Why this temperature could not be computed (e.g. outside the model's range). */
  error?: string
}

export interface StudyResults {
  rows: StudyRow[]
  method: string
  engineVersion: string
}

/**
 * A sizing study: at each temperature of the envelope, the usable volume (with the
 * compression-ratio warnings of the accumulator type), the discharge curve, the pre-charge
 * sweep with its optimum, and the inverse (gas volume needed), all by the shared engine.
 * Limits that are wrong at every temperature (minimum above maximum) throw; a temperature
 * the model cannot take is reported on its row.
 */
export function computeStudy(input: StudyInput): StudyResults {
  const { name: _name, specificationId: _specification, accumulatorType, envelope, inverse, ...conditions } = input
  const rows = envelope.map(({ label, temperature }): StudyRow => {
    const at = { ...conditions, operatingTemperature: temperature }
    try {
      const result = usableVolume(at)
      result.warnings.push(...compressionRatioWarnings(result, accumulatorType, conditions.ambient))
      const { delivered, pressure, applications } = dischargeCurve({ ...at, points: 40 })
      const { gasVolume: _gasVolume, ...withoutVolume } = at
      const { precharge, usable, optimum } = prechargeSweep({ ...withoutVolume, gasVolume: conditions.gasVolume, prechargeUnit: { unit: conditions.precharge.unit, basis: conditions.precharge.basis }, points: 40 })
      let required: StudyRow['required']
      if (inverse?.usable || (inverse?.applications && conditions.perApplication)) {
        const answer = requiredVolume({ ...withoutVolume, ...(inverse.usable ? { usable: inverse.usable } : { applications: inverse.applications }) })
        required = { gasVolume: answer.gasVolume, applications: answer.check.applications }
      }
      return { label, temperature, result, curve: { delivered, pressure, applications }, sweep: { precharge, usable, optimum }, required }
    }
    catch (error) {
      if (error instanceof EngineInputError && error.field !== 'minPressure' && error.field !== 'precharge') return { label, temperature, error: error.message }
      throw error
    }
  })
  return { rows, method: rows.find(row => row.result)?.result?.method ?? '', engineVersion: ENGINE_VERSION }
}
