import { create, invDependencies, multiplyDependencies, transposeDependencies } from 'mathjs'
import { EngineInputError } from './errors'
import type { Pressure, Provenance } from './types'
import { convertPressure, convertPressureDifference } from './units'
import { ENGINE_VERSION } from './version'

// Only the matrix functions the fit needs (mathjs is tree-shaken to them on the tablet).
const math = create({ invDependencies, multiplyDependencies, transposeDependencies } as Parameters<typeof create>[0])

/** A gauge reading taken a number of minutes after the charge or vent ended. */
export interface SettleReading {
  minutesAfter: number
  pressure: Pressure
}

export interface SettleForecastInput {
  /** Two or more readings at different times, after the charge or vent. */
  readings: SettleReading[]
  /**
   * The time constant expected when two readings cannot fix it themselves (minutes): from three
   * readings on, it is fitted.
   */
  timeConstantMinutes?: number
  /** How far one reading can be off (the gauge's accuracy or resolution), in the readings' unit. */
  readingUncertainty?: number
  /** The limits the settled reading must land in (at the ambient temperature the gas settles to). */
  band?: { low: Pressure, high: Pressure }
}

export type SettleVerdict = 'in-limits' | 'low' | 'high' | 'undecided'

export interface SettleForecast extends Provenance<SettleForecastInput> {
  /** The reading the gauge is heading for once the gas is at ambient temperature. */
  settled: Pressure
  /** ± around `settled`, about 95 % (two standard deviations), in the same unit. */
  uncertainty: number
  timeConstantMinutes: number
  /** How the time constant was found. */
  fitted: 'three-point' | 'least-squares' | 'assumed-time-constant'
  /** Against the band: in limits or outside it even at the edge of the uncertainty, otherwise undecided. */
  verdict?: SettleVerdict
  /** Minutes after the action when the reading will be within its uncertainty of the settled value. */
  settledAfterMinutes: number
  warnings: string[]
}

const METHOD
  = 'Newton\'s law of cooling: the gas temperature relaxes exponentially toward ambient, and at constant volume '
    + 'the pressure follows it (Gay-Lussac), so p(t) = p∞ + (p₀ − p∞)·e^(−t/τ).'

/** p∞ and the amplitude for a given τ: the model is linear in them, so least squares is a 2 × 2 solve. */
function linearFit(times: number[], values: number[], tau: number) {
  const n = times.length
  const e = times.map(time => Math.exp(-time / tau))
  const se = e.reduce((sum, value) => sum + value, 0)
  const see = e.reduce((sum, value) => sum + value * value, 0)
  const sp = values.reduce((sum, value) => sum + value, 0)
  const spe = values.reduce((sum, value, index) => sum + value * e[index]!, 0)
  const determinant = n * see - se * se
  const settled = (sp * see - se * spe) / determinant
  const amplitude = (n * spe - se * sp) / determinant
  const sse = values.reduce((sum, value, index) => sum + (value - settled - amplitude * e[index]!) ** 2, 0)
  return { settled, amplitude, sse }
}

/** The τ that minimises the squared residuals (golden-section search on log τ; the residual is unimodal here). */
function bestTimeConstant(times: number[], values: number[]): number {
  const span = Math.max(...times) - Math.min(...times)
  let low = Math.log(span / 50)
  let high = Math.log(span * 50)
  const cost = (logTau: number) => linearFit(times, values, Math.exp(logTau)).sse
  const golden = (Math.sqrt(5) - 1) / 2
  for (let step = 0; step < 120; step++) {
    const a = high - golden * (high - low)
    const b = low + golden * (high - low)
    if (cost(a) < cost(b)) high = b
    else low = a
  }
  return Math.exp((low + high) / 2)
}

/**
 * Forecast of the reading a gauge will settle at after a charge or vent, from readings taken while
 * the gas cools (after a charge) or warms (after a vent) toward ambient. Newton's law of cooling
 * with the gas law: p(t) = p∞ + (p₀ − p∞)·e^(−t/τ). With three or more readings τ is fitted
 * (nonlinear least squares; for three equally spaced readings it is Aitken's closed form,
 * p∞ = (p₁p₃ − p₂²)/(p₁ + p₃ − 2p₂)); with two, τ is taken from `timeConstantMinutes`. The
 * uncertainty is two standard deviations of p∞, from the fit's covariance σ²(JᵀJ)⁻¹ with σ the
 * larger of the residual scatter and the reading uncertainty. Advice only: the approved data's
 * settle time remains the rule.
 */
export function forecastSettledPressure(input: SettleForecastInput): SettleForecast {
  const readings = [...input.readings].sort((a, b) => a.minutesAfter - b.minutesAfter)
  if (readings.length < 2)
    throw new EngineInputError('Two readings at different times are needed for a forecast.', 'readings')
  const { unit, basis } = readings[0]!.pressure
  readings.forEach((reading, index) => {
    if (!Number.isFinite(reading.minutesAfter) || reading.minutesAfter < 0) {
      throw new EngineInputError(
        'Give each reading\'s minutes after the charge or vent (zero or more).',
        `readings.${index}.minutesAfter`,
      )
    }
    if (reading.pressure.basis !== basis)
      throw new EngineInputError(
        'Give every reading on the same basis (gauge or absolute).',
        `readings.${index}.pressure.basis`,
      )
  })
  const times = readings.map(reading => reading.minutesAfter)
  if (new Set(times).size !== times.length)
    throw new EngineInputError('Two readings were taken at the same minute; give each its own time.', 'readings')
  const values = readings.map(reading => convertPressure(reading.pressure, unit).value)
  const warnings: string[] = []
  const deltaReading = input.readingUncertainty ?? 0

  let tau: number
  let fitted: SettleForecast['fitted']
  if (readings.length >= 3) {
    tau = bestTimeConstant(times, values)
    const spacing = times[1]! - times[0]!
    fitted = readings.length === 3 && Math.abs(times[2]! - times[1]! - spacing) < 1e-9 ? 'three-point' : 'least-squares'
  }
  else {
    if (!input.timeConstantMinutes || input.timeConstantMinutes <= 0) {
      throw new EngineInputError(
        'With two readings, give the expected time constant (or take a third reading).',
        'timeConstantMinutes',
      )
    }
    tau = input.timeConstantMinutes
    fitted = 'assumed-time-constant'
    warnings.push(
      'Only two readings: the time constant is assumed, not measured. A third reading makes the forecast firmer.',
    )
  }
  const { settled, amplitude, sse } = linearFit(times, values, tau)
  if (Math.abs(values.at(-1)! - values[0]!) <= deltaReading) {
    warnings.push(
      'The readings barely change: the gas is close to settled already, or the readings are too close together to tell.',
    )
  }

  // Uncertainty of p∞ from the covariance of (p∞, A, τ), or of (p∞, A) with τ assumed.
  const rows = times.map((time) => {
    const e = Math.exp(-time / tau)
    return fitted === 'assumed-time-constant' ? [1, e] : [1, e, (amplitude * time * e) / (tau * tau)]
  })
  const parameters = rows[0]!.length
  const dof = readings.length - parameters
  const sigma = Math.max(dof > 0 ? Math.sqrt(sse / dof) : 0, deltaReading)
  let uncertainty: number
  try {
    const covariance = math.inv(math.multiply(math.transpose(rows), rows)) as number[][]
    uncertainty = 2 * sigma * Math.sqrt(Math.max(0, covariance[0]![0]!))
  }
  catch {
    warnings.push('The readings do not pin the settled value down (they lie on a line): take another reading later.')
    uncertainty = Math.abs(amplitude)
  }
  if (fitted === 'assumed-time-constant') {
    // The assumed τ itself could be off by a factor of two either way.
    const spread = [tau / 2, tau * 2].map(candidate => Math.abs(linearFit(times, values, candidate).settled - settled))
    uncertainty = Math.hypot(uncertainty, Math.max(...spread))
  }
  if (tau > 5 * (times.at(-1)! - times[0]!))
    warnings.push('The gas has far to go yet: the forecast is rough; read again in a few minutes.')

  const result: SettleForecast = {
    settled: { value: settled, unit, basis },
    uncertainty,
    timeConstantMinutes: tau,
    fitted,
    // Within the uncertainty of the settled value: |A|·e^(−t/τ) ≤ max(uncertainty, reading uncertainty).
    settledAfterMinutes: Math.max(
      0,
      tau * Math.log(Math.abs(amplitude) / Math.max(uncertainty, deltaReading, 1e-9 * Math.abs(settled))),
    ),
    warnings,
    inputs: input,
    method:
      `${METHOD} ${fitted === 'assumed-time-constant' ? `τ assumed ${tau.toFixed(1)} min` : `τ fitted ${tau.toFixed(1)} min`}; `
      + `uncertainty two standard deviations. Advice only: the settle time in the approved data remains the rule.`,
    engineVersion: ENGINE_VERSION,
  }
  if (input.band) {
    const low = convertPressure(input.band.low, unit).value
    const high = convertPressure(input.band.high, unit).value
    if (input.band.low.basis !== basis || input.band.high.basis !== basis)
      throw new EngineInputError('Give the band on the readings\' basis.', 'band')
    result.verdict
      = settled - uncertainty >= low && settled + uncertainty <= high
        ? 'in-limits'
        : settled + uncertainty < low
          ? 'low'
          : settled - uncertainty > high
            ? 'high'
            : 'undecided'
  }
  return result
}

/**
 * The time constant the settle time implies: the approved data's settle time taken as four time constants (98
 * % settled).
 */
export function timeConstantFromSettleTime(settleMinutes: number): number {
  return settleMinutes / 4
}

/** A gauge's reading uncertainty in the readings' unit (± accuracy), for the forecast. */
export function readingUncertaintyOf(
  accuracy: { value: number, unit: Pressure['unit'] } | undefined,
  unit: Pressure['unit'],
): number | undefined {
  return accuracy ? convertPressureDifference(accuracy.value, accuracy.unit, unit) : undefined
}
