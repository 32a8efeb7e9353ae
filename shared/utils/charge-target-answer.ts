import { assessReadingSchema, chargeTargetSchema, correctionCurveSchema, tableTargetSchema } from '../schemas/calc'
import {
  assessReading,
  chargeTarget,
  chargeTargetFromTable,
  correctionCurve,
  type ChargeTargetResult,
  type CorrectionCurveInput,
  type CorrectionCurveResult,
  type ReadingAssessment,
  type TableTargetResult,
} from '../gas/charge-target'
import type { Pressure } from '../gas/types'
import { calculate, type Calculated } from './calculation'
import type { SpecificationTargetRequest } from './specification-target'

/** What the Charge target page asks: the target, the curves to plot (gas-law method), the as-found to judge. */
export interface ChargeTargetRequest {
  target: SpecificationTargetRequest
  /** Curves to plot (real and ideal), for the gas-law method. */
  curves?: { real: CorrectionCurveInput, ideal: CorrectionCurveInput }
  asFound?: Pressure
}

export interface ChargeTargetAnswer {
  request: ChargeTargetRequest
  target: ChargeTargetResult | TableTargetResult
  curves: { real: CorrectionCurveResult, ideal: CorrectionCurveResult } | null
  assessment: ReadingAssessment | null
}

/**
 * The target, its plotted curves and the as-found verdict for one request, each checked with its calculation
 * route's schema and computed by the engine as that route does — or why there is no figure.
 */
export function chargeTargetAnswer(request: ChargeTargetRequest): Calculated<ChargeTargetAnswer> {
  const { target: asked } = request
  const target = asked.route === 'charge-target'
    ? calculate(chargeTargetSchema, asked.body, chargeTarget, 'gasTemperature')
    : calculate(tableTargetSchema, asked.body, chargeTargetFromTable, 'gasTemperature')
  if (target.refusal) return target
  const result = target.result
  const real = request.curves ? calculate(correctionCurveSchema, request.curves.real, correctionCurve, 'from') : null
  const ideal = request.curves ? calculate(correctionCurveSchema, request.curves.ideal, correctionCurve, 'from') : null
  const assessment = request.asFound && result.low && result.high
    ? calculate(assessReadingSchema, {
        reading: request.asFound,
        target: result.target,
        low: result.low,
        high: result.high,
        ambient: asked.body.ambient,
      }, assessReading, 'reading')
    : null
  const refused = [real, ideal, assessment].find(part => part?.refusal)
  if (refused?.refusal) return { refusal: refused.refusal }
  return {
    result: {
      request,
      target: result,
      curves: real?.result && ideal?.result ? { real: real.result, ideal: ideal.result } : null,
      assessment: assessment?.result ?? null,
    },
  }
}
