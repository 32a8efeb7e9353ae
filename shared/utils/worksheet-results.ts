import { assessReading, type ReadingAssessment } from '../gas/charge-target'
import type { Ambient, Pressure, Temperature } from '../gas/types'
import { convertPressureDifference } from '../gas/units'
import type { SpecificationDto } from '../types/registers'
import type { ToolSnapshot } from '../types/worksheet'
import { specificationChargeTarget } from './specification-target'

/** The frozen result of one reading: target and band at its gas temperature, and the verdict. */
export interface AssessmentSummary {
  gasTemperature: Temperature
  target: Pressure
  low: Pressure
  high: Pressure
  ambientPressure: Pressure
  method: string
  assessment: Pick<ReadingAssessment, 'verdict' | 'difference' | 'outsideBy' | 'nearLimit' | 'warnings'>
  engineVersion: string
}

/**
 * Target, band and verdict for a reading taken at a gas temperature, from the frozen
 * specification and the gauge's accuracy. The server calls this for every reading it stores.
 */
export function assessWorksheetReading(
  specification: Omit<SpecificationDto, 'status' | 'id' | 'title'>,
  reading: Pressure,
  gasTemperature: Temperature,
  ambient: Ambient,
  gauge?: ToolSnapshot,
): AssessmentSummary {
  const target = specificationChargeTarget(specification, gasTemperature, ambient)
  const gaugeAccuracy = gauge?.accuracy
    ? {
        value: convertPressureDifference(gauge.accuracy.value, gauge.accuracy.unit, target.target.unit),
        unit: target.target.unit,
      }
    : undefined
  const assessment = assessReading({
    reading,
    target: target.target,
    low: target.low!,
    high: target.high!,
    gaugeAccuracy,
    ambient,
  })
  return {
    gasTemperature,
    target: target.target,
    low: target.low!,
    high: target.high!,
    ambientPressure: target.ambientPressure,
    method: target.method,
    assessment: {
      verdict: assessment.verdict,
      difference: assessment.difference,
      outsideBy: assessment.outsideBy,
      nearLimit: assessment.nearLimit,
      warnings: assessment.warnings,
    },
    engineVersion: target.engineVersion,
  }
}
