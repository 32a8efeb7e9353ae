import { EngineInputError } from '../gas/errors'
import {
  compressionRatioWarnings,
  dischargeCurve,
  prechargeSweep,
  requiredVolume,
  usableVolume,
  type DischargeCurveResult,
  type PrechargeSweepResult,
  type UsableVolumeResult,
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
  /** Against the required number of applications, when one is given: does this temperature give them? */
  verdict?: { required: number, delivered: number, meets: boolean }
  /** Why this temperature could not be computed (e.g. outside the model's range). */
  error?: string
}

export interface StudyResults {
  rows: StudyRow[]
  /** The study's answer to "does it give the required applications?" across the envelope. */
  verdict?: { required: number, meets: boolean, message: string }
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
      const { precharge, usable, optimum } = prechargeSweep({
        ...withoutVolume,
        gasVolume: conditions.gasVolume,
        prechargeUnit: { unit: conditions.precharge.unit, basis: conditions.precharge.basis },
        points: 40,
      })
      let required: StudyRow['required']
      if (inverse?.usable || (inverse?.applications && conditions.perApplication)) {
        const answer = requiredVolume({
          ...withoutVolume,
          ...(inverse.usable ? { usable: inverse.usable } : { applications: inverse.applications }),
        })
        required = { gasVolume: answer.gasVolume, applications: answer.check.applications }
      }
      const verdict
        = inverse?.applications && result.applications !== undefined
          ? {
              required: inverse.applications,
              delivered: result.applications,
              meets: result.applications >= inverse.applications,
            }
          : undefined
      return {
        label,
        temperature,
        result,
        curve: { delivered, pressure, applications },
        sweep: { precharge, usable, optimum },
        required,
        verdict,
      }
    }
    catch (error) {
      if (error instanceof EngineInputError && error.field !== 'minPressure' && error.field !== 'precharge')
        return { label, temperature, error: error.message }
      throw error
    }
  })
  return {
    rows,
    verdict: envelopeVerdict(rows, inverse?.applications),
    method: rows.find(row => row.result)?.result?.method ?? '',
    engineVersion: ENGINE_VERSION,
  }
}

/** Meets the requirement only if every temperature of the envelope does (a row that could not be computed does not). */
function envelopeVerdict(rows: StudyRow[], required: number | undefined): StudyResults['verdict'] {
  if (!required) return undefined
  const short = rows.filter(row => !row.verdict?.meets)
  if (short.length === 0)
    return {
      required,
      meets: true,
      message: `Meets the requirement: at least ${required} full applications at every temperature of the envelope.`,
    }
  const where = short
    .map(row =>
      row.verdict ? `${row.label} (${row.verdict.delivered} of ${required})` : `${row.label} (not computed)`,
    )
    .join(', ')
  return {
    required,
    meets: false,
    message: `Short of ${required} full applications at ${where}. A larger gas volume or other limits are needed; the gas volume each temperature needs is shown beside it.`,
  }
}
