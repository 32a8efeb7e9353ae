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
  /** Two or more readings at different times, after the charge or vent (on one basis, any units). */
  readings: SettleReading[]
  /**
   * The time constant expected (minutes), e.g. from the approved data's settle time. Needed with two
   * readings; with three or more it is a prior the readings refine (a factor of two either way is one
   * standard deviation), so a reading added on the curve never makes the forecast looser.
   */
  timeConstantMinutes?: number
  /** The gauge's stated accuracy, ± in the unit of the first reading. */
  readingUncertainty?: number
  /** The smallest step the gauge shows, in the unit of the first reading. */
  resolution?: number
  /** The limits the settled reading must land in (at the ambient temperature the gas settles to). */
  band?: { low: Pressure, high: Pressure }
}

/** `undecided`: too close to tell — the 2σ interval crosses a band edge. */
export type SettleVerdict = 'in-limits' | 'low' | 'high' | 'undecided'

export interface SettleForecast extends Provenance<SettleForecastInput> {
  /** The reading the gauge is heading for once the gas is at ambient temperature. */
  settled: Pressure
  /** ± around `settled`: two standard deviations of p∞ (about 95 %), in the same unit. */
  uncertainty: number
  /** The standard deviation of one reading the fit used, and where it came from. */
  readingSigma: { value: number, unit: Pressure['unit'], source: 'stated-accuracy' | 'resolution' | 'default' | 'scatter' }
  timeConstantMinutes: number
  /** How the time constant was found. */
  fitted: 'three-point' | 'least-squares' | 'assumed-time-constant'
  /** Against the band: in limits or outside it even at the edge of the ±, otherwise undecided (too close to tell). */
  verdict?: SettleVerdict
  /** Minutes after the action when the reading will be within its uncertainty of the settled value. */
  settledAfterMinutes: number
  warnings: string[]
}

const METHOD
  = 'Newton\'s law of cooling: the gas temperature relaxes exponentially toward ambient, and at constant volume '
    + 'the pressure follows it (Gay-Lussac), so p(t) = p∞ + Δ·e^(−t/τ).'

/**
 * The gauge a forecast assumes when it states nothing: ±1 % of the reading (common practice, no source; a
 * Grade A dial gauge holds ±1 % of span over its middle half, ASME B40.100 — from memory) and a resolution
 * of one step of the unit's usual dial (1 psi, 0.1 bar, 10 kPa, 0.01 MPa; common practice, no source).
 */
export const DEFAULT_GAUGE = {
  accuracyFraction: 0.01,
  resolution: { psi: 1, bar: 0.1, kPa: 10, MPa: 0.01 } as Record<Pressure['unit'], number>,
}

/** A time constant given as expected is known to a factor of two (one standard deviation of ln τ). */
const PRIOR_SIGMA_LOG_TAU = Math.LN2

/** p∞ and Δ for a given τ: the model is linear in them, so least squares is a 2 × 2 solve. */
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

/**
 * The ln τ that minimises the weighted squared residuals plus, with an expected τ, the prior's term
 * (variable projection: for each τ, p∞ and Δ are linear). A grid over the range, then golden-section
 * search around the best grid point.
 */
function bestLogTimeConstant(
  times: number[], values: number[], sigma: number, prior?: { logTau: number, sigma: number },
): number {
  const span = Math.max(...times) - Math.min(...times)
  let low = Math.log(span / 50)
  let high = Math.log(span * 50)
  if (prior) {
    low = Math.min(low, prior.logTau - 5 * prior.sigma)
    high = Math.max(high, prior.logTau + 5 * prior.sigma)
  }
  const cost = (logTau: number) => {
    const fit = linearFit(times, values, Math.exp(logTau))
    const misfit = Number.isFinite(fit.sse) ? fit.sse / (sigma * sigma) : Number.POSITIVE_INFINITY
    return misfit + (prior ? ((logTau - prior.logTau) / prior.sigma) ** 2 : 0)
  }
  const steps = 240
  let best = low
  let bestCost = Number.POSITIVE_INFINITY
  for (let step = 0; step <= steps; step++) {
    const logTau = low + ((high - low) * step) / steps
    const value = cost(logTau)
    if (value < bestCost) {
      bestCost = value
      best = logTau
    }
  }
  const width = (high - low) / steps
  let a0 = best - width
  let b0 = best + width
  const golden = (Math.sqrt(5) - 1) / 2
  for (let step = 0; step < 80; step++) {
    const a = b0 - golden * (b0 - a0)
    const b = a0 + golden * (b0 - a0)
    if (cost(a) < cost(b)) b0 = b
    else a0 = a
  }
  return (a0 + b0) / 2
}

/** The inverse of a small symmetric matrix, or null when it is singular or not finite. */
function inverse(matrix: number[][]): number[][] | null {
  try {
    const result = math.inv(matrix) as number[][]
    return result.every(row => row.every(Number.isFinite)) ? result : null
  }
  catch {
    return null
  }
}

/**
 * Forecast of the reading a gauge will settle at after a charge or vent, from readings taken while
 * the gas cools (after a charge) or warms (after a vent) toward ambient: p(t) = p∞ + Δ·e^(−t/τ), fitted
 * by nonlinear least squares in (p∞, Δ, ln τ). With an expected τ (the approved data's settle time),
 * ln τ has a prior of that value ± ln 2, so two readings give a forecast and each further reading
 * refines it; with three or more and no expected τ, τ comes from the readings alone (for three
 * equally spaced readings that is Aitken's closed form, p∞ = (p₁p₃ − p₂²)/(p₁ + p₃ − 2p₂)).
 *
 * Uncertainty: the parameter covariance (JᵀJ/σ² + prior)⁻¹, its p∞ term carried to a 2σ interval.
 * σ, the standard deviation of one reading, is never below the gauge's stated accuracy or its
 * resolution (DEFAULT_GAUGE when the gauge states neither); with more readings than parameters, the
 * residual scatter raises it when larger. Advice only: the approved data's settle time is the rule.
 */
export function forecastSettledPressure(input: SettleForecastInput): SettleForecast {
  if (input.readings.length < 2)
    throw new EngineInputError('Two readings at different times are needed for a forecast.', 'readings')
  const { unit, basis } = input.readings[0]!.pressure
  // Checked in the order sent, so an error names the reading as the caller numbered it.
  input.readings.forEach((reading, index) => {
    if (!Number.isFinite(reading.minutesAfter) || reading.minutesAfter < 0) {
      throw new EngineInputError(
        'Give each reading\'s minutes after the charge or vent (zero or more).',
        `readings.${index}.minutesAfter`,
      )
    }
    if (reading.pressure.basis !== basis)
      throw new EngineInputError(
        `Give every reading on the same basis: reading 1 is ${basis}, this one ${reading.pressure.basis}.`,
        `readings.${index}.pressure.basis`,
      )
    const twin = input.readings.findIndex(other => other.minutesAfter === reading.minutesAfter)
    if (twin !== index)
      throw new EngineInputError(
        `Readings ${twin + 1} and ${index + 1} were taken at the same minute; give each its own time.`,
        `readings.${index}.minutesAfter`,
      )
  })
  const readings = [...input.readings].sort((a, b) => a.minutesAfter - b.minutesAfter)
  const times = readings.map(reading => reading.minutesAfter)
  const values = readings.map(reading => convertPressure(reading.pressure, unit).value)
  const warnings: string[] = []

  // One reading's standard deviation: never below the stated accuracy nor the resolution.
  const floors: Array<[number, SettleForecast['readingSigma']['source']]> = [
    [input.readingUncertainty ?? DEFAULT_GAUGE.accuracyFraction * Math.max(...values.map(Math.abs)),
      input.readingUncertainty === undefined ? 'default' : 'stated-accuracy'],
    [input.resolution ?? DEFAULT_GAUGE.resolution[unit], input.resolution === undefined ? 'default' : 'resolution'],
  ]
  let [readingSigma, sigmaSource] = floors.reduce((a, b) => (b[0] > a[0] ? b : a))
  if (!(readingSigma > 0)) [readingSigma, sigmaSource] = [DEFAULT_GAUGE.resolution[unit], 'default']
  if (input.readingUncertainty === undefined && input.resolution === undefined)
    warnings.push('The gauge states no accuracy: the forecast assumes ±1 % of the reading.')

  const expected = input.timeConstantMinutes
  if (readings.length === 2 && !(expected && expected > 0)) {
    throw new EngineInputError(
      'With two readings, give the expected time constant (or take a third reading).',
      'timeConstantMinutes',
    )
  }
  const prior = expected && expected > 0 ? { logTau: Math.log(expected), sigma: PRIOR_SIGMA_LOG_TAU } : undefined
  const logTau = readings.length === 2
    ? prior!.logTau
    : bestLogTimeConstant(times, values, readingSigma, prior)
  const tau = Math.exp(logTau)
  const fitted: SettleForecast['fitted'] = readings.length === 2
    ? 'assumed-time-constant'
    : !prior && readings.length === 3 && Math.abs(times[2]! - 2 * times[1]! + times[0]!) < 1e-9
        ? 'three-point'
        : 'least-squares'
  if (readings.length === 2) {
    warnings.push(
      'Only two readings: the time constant is assumed, not measured. A third reading makes the forecast firmer.',
    )
  }
  const { settled, amplitude, sse } = linearFit(times, values, tau)
  if (Math.abs(values.at(-1)! - values[0]!) <= readingSigma) {
    warnings.push(
      'The readings barely change: the gas is close to settled already, or the readings are too close together to tell.',
    )
  }

  // σ: raised by the residual scatter only where there are more readings than parameters.
  const dof = readings.length - 3
  const scatter = dof > 0 ? Math.sqrt(sse / dof) : 0
  if (scatter > readingSigma) [readingSigma, sigmaSource] = [scatter, 'scatter']

  // Information matrix of (p∞, Δ, ln τ): the readings' JᵀJ/σ², plus the prior on ln τ.
  const rows = times.map((time) => {
    const e = Math.exp(-time / tau)
    return [1, e, (amplitude * e * time) / tau]
  })
  const information = [0, 1, 2].map(i => [0, 1, 2].map(j =>
    rows.reduce((sum, row) => sum + row[i]! * row[j]!, 0) / readingSigma ** 2))
  if (prior) information[2]![2]! += 1 / prior.sigma ** 2
  let covariance = inverse(information)
  if (!covariance) {
    // Δ ≈ 0: τ has no effect on the readings, so it drops out; p∞ and Δ alone.
    const reduced = inverse(information.slice(0, 2).map(row => row.slice(0, 2)))
    covariance = reduced ? [[reduced[0]![0]!]] : null
  }
  let uncertainty: number
  if (covariance && covariance[0]![0]! >= 0) {
    uncertainty = 2 * Math.sqrt(covariance[0]![0]!)
  }
  else {
    warnings.push('The readings do not pin the settled value down (they lie on a line): take another reading later.')
    uncertainty = Math.max(Math.abs(amplitude), 2 * readingSigma)
  }
  if (tau > 5 * (times.at(-1)! - times[0]!))
    warnings.push('The gas has far to go yet: the forecast is rough; read again in a few minutes.')

  const sigmaWords = {
    'stated-accuracy': 'the gauge\'s stated accuracy',
    'resolution': 'the gauge\'s resolution',
    'default': 'an assumed ±1 % of the reading (the gauge states none)',
    'scatter': 'the readings\' own scatter about the curve',
  }[sigmaSource]
  const result: SettleForecast = {
    settled: { value: settled, unit, basis },
    uncertainty,
    readingSigma: { value: readingSigma, unit, source: sigmaSource },
    timeConstantMinutes: tau,
    fitted,
    // Within the uncertainty of the settled value: |Δ|·e^(−t/τ) ≤ max(uncertainty, one reading's σ).
    settledAfterMinutes: Math.max(
      0,
      tau * Math.log(Math.abs(amplitude) / Math.max(uncertainty, readingSigma, 1e-9 * Math.abs(settled))),
    ),
    warnings,
    inputs: input,
    method:
      `${METHOD} Nonlinear least squares in p∞, Δ and ln τ; `
      + `${fitted === 'assumed-time-constant' ? `τ assumed ${tau.toFixed(1)} min (± a factor of two)` : prior ? `τ fitted ${tau.toFixed(1)} min, starting from ${expected!.toFixed(1)} min ± a factor of two` : `τ fitted ${tau.toFixed(1)} min`}. `
      + `The ± is two standard deviations of p∞ from the fit's covariance, with one reading's σ = `
      + `${readingSigma.toPrecision(3)} ${unit} (${sigmaWords}). Assumes the gas exchanges heat with still surroundings at `
      + `one temperature, no leak, and readings independent of one another. `
      + `Advice only: the settle time in the approved data remains the rule.`,
    engineVersion: ENGINE_VERSION,
  }
  if (input.band) {
    if (input.band.low.basis !== basis || input.band.high.basis !== basis)
      throw new EngineInputError('Give the band on the readings\' basis.', 'band')
    const low = convertPressure(input.band.low, unit).value
    const high = convertPressure(input.band.high, unit).value
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
