import { ambientPressure, describeAmbient } from './atmosphere'
import { EngineInputError } from './errors'
import { formatTemperature } from './format'
import { describeModel, gasLaw, stateAt, stateAtTemperature } from './gas-law'
import type { Ambient, GasModel, Pressure, PressureUnit, Provenance, TablePoint, Temperature, Tolerance } from './types'
import {
  kelvinToTemperature,
  pascalAbsoluteToPressure,
  pressureDifferenceToPascal,
  pressureToPascalAbsolute,
  temperatureToKelvin,
} from './units'
import { ENGINE_VERSION } from './version'

export interface ChargeTargetInput {
  reference: { pressure: Pressure, temperature: Temperature }
  gasTemperature: Temperature
  ambient?: Ambient
  model?: GasModel
  tolerance?: Tolerance
}

export interface ChargeTargetResult extends Provenance<ChargeTargetInput> {
  target: Pressure
  low?: Pressure
  high?: Pressure
  /** Absolute, in the reference's unit. */
  ambientPressure: Pressure
}

/** The band ends at the reference temperature, Pa absolute. */
function referenceBand(
  referencePa: number,
  reference: Pressure,
  tolerance: Tolerance,
  ambientPa: number,
): { low: number, high: number } {
  const stated = reference.basis === 'gauge' ? referencePa - ambientPa : referencePa
  const toPascal = (amount: number) =>
    tolerance.unit === '%' ? (stated * amount) / 100 : pressureDifferenceToPascal(amount, tolerance.unit)
  return { low: referencePa - toPascal(tolerance.minus), high: referencePa + toPascal(tolerance.plus) }
}

/**
 * Temperature-corrected pre-charge: the pressure a fixed mass of gas in a fixed volume shows
 * at the gas temperature now, for a pre-charge stated at a reference temperature.
 * Ideal model: Gay-Lussac's law p₂ = p₁·T₂/T₁ (absolute units). Real model: constant density
 * in the nitrogen equation of state of Span et al. (2000). The tolerance band's ends are
 * carried to the gas temperature the same way as the target.
 */
/** A state at the reference temperature carried at constant density to the gas temperature, in the reference's unit. */
function carryToTemperature(
  law: ReturnType<typeof gasLaw>,
  pascals: number,
  referenceK: number,
  gasK: number,
  pressure: Pressure,
  ambientPa: number,
): Pressure {
  if (!(pascals > 0))
    throw new EngineInputError('The low end of the tolerance band is at or below zero absolute.', 'tolerance.minus')
  const state = stateAtTemperature(law, stateAt(law, pascals, referenceK), gasK)
  law.checkInput(gasK, state.pressure, 'gasTemperature')
  return pascalAbsoluteToPressure(state.pressure, pressure.unit, pressure.basis, ambientPa)
}

export function chargeTarget(input: ChargeTargetInput): ChargeTargetResult {
  const model = input.model ?? 'real'
  const law = gasLaw(model)
  const ambientPa = ambientPressure(input.ambient)
  const { pressure, temperature } = input.reference
  const referencePa = pressureToPascalAbsolute(pressure, ambientPa)
  const referenceK = temperatureToKelvin(temperature)
  const gasK = temperatureToKelvin(input.gasTemperature)
  law.checkInput(referenceK, referencePa, 'reference.pressure')
  law.checkInput(gasK, referencePa, 'gasTemperature')

  const result: ChargeTargetResult = {
    target: carryToTemperature(law, referencePa, referenceK, gasK, pressure, ambientPa),
    ambientPressure: pascalAbsoluteToPressure(ambientPa, pressure.unit, 'absolute', ambientPa),
    inputs: input,
    method: `${describeModel(model)}, constant gas mass and volume${model === 'real' ? ' (constant density)' : ' (Gay-Lussac, p/T = const)'}; ${describeAmbient(input.ambient)}`,
    engineVersion: ENGINE_VERSION,
  }
  if (input.tolerance) {
    const band = referenceBand(referencePa, pressure, input.tolerance, ambientPa)
    result.low = carryToTemperature(law, band.low, referenceK, gasK, pressure, ambientPa)
    result.high = carryToTemperature(law, band.high, referenceK, gasK, pressure, ambientPa)
  }
  return result
}

export interface TableTargetInput {
  points: TablePoint[]
  gasTemperature: Temperature
  ambient?: Ambient
  tolerance?: Tolerance
}

export interface TableTargetResult extends Provenance<TableTargetInput> {
  target: Pressure
  low?: Pressure
  high?: Pressure
  ambientPressure: Pressure
  /** The two table points the target lies between. */
  between: [TablePoint, TablePoint]
}

/** Two table temperatures closer than this (kelvin) are one temperature written twice. */
export const TABLE_TEMPERATURE_TOLERANCE_K = 0.001

/**
 * The pre-charge from an approved-data table of temperature/pressure points, by linear
 * interpolation in temperature. Outside the table's range it refuses: the approved data does
 * not say what holds there, so nothing is extrapolated. The tolerance applies at the
 * interpolated value.
 */
export function chargeTargetFromTable(input: TableTargetInput): TableTargetResult {
  const ambientPa = ambientPressure(input.ambient)
  if (input.points.length < 2) throw new EngineInputError('An approved-data table needs at least two points.', 'points')
  const first = input.points[0]!.pressure
  const rows = input.points
    .map((point, index) => ({
      point,
      index,
      kelvin: temperatureToKelvin(point.temperature),
      pascals: pressureToPascalAbsolute(point.pressure, ambientPa),
    }))
    .sort((a, b) => a.kelvin - b.kelvin)
  for (let i = 1; i < rows.length; i++) {
    // The same temperature written in two units (0 °C and 32 °F) differs by rounding only.
    if (rows[i]!.kelvin - rows[i - 1]!.kelvin < TABLE_TEMPERATURE_TOLERANCE_K) {
      const [earlier, later] = [rows[i - 1]!, rows[i]!].sort((a, b) => a.index - b.index)
      throw new EngineInputError(
        `Table points ${earlier!.index + 1} (${formatTemperature(earlier!.point.temperature)}) and ${later!.index + 1} (${formatTemperature(later!.point.temperature)}) are the same temperature.`,
        `points.${later!.index}.temperature`,
      )
    }
  }
  const gasK = temperatureToKelvin(input.gasTemperature)
  const lowest = rows[0]!
  const highest = rows[rows.length - 1]!
  if (gasK < lowest.kelvin - 1e-9 || gasK > highest.kelvin + 1e-9) {
    const unit = input.gasTemperature.unit
    const show = (k: number) => formatTemperature(kelvinToTemperature(k, unit))
    throw new EngineInputError(
      `Gas temperature ${show(gasK)} is outside the approved-data table (${show(lowest.kelvin)} to ${show(highest.kelvin)}); the table must not be extrapolated.`,
      'gasTemperature',
    )
  }
  let upper = rows.findIndex(row => row.kelvin >= gasK)
  if (upper === 0) upper = 1
  const a = rows[upper - 1]!
  const b = rows[upper]!
  const targetPa = a.pascals + ((b.pascals - a.pascals) * (gasK - a.kelvin)) / (b.kelvin - a.kelvin)
  const show = (pascals: number) => pascalAbsoluteToPressure(pascals, first.unit, first.basis, ambientPa)
  const result: TableTargetResult = {
    target: show(targetPa),
    ambientPressure: pascalAbsoluteToPressure(ambientPa, first.unit, 'absolute', ambientPa),
    between: [a.point, b.point],
    inputs: input,
    method: `linear interpolation in the approved-data table between ${formatTemperature(a.point.temperature)} and ${formatTemperature(b.point.temperature)}; ${describeAmbient(input.ambient)}`,
    engineVersion: ENGINE_VERSION,
  }
  if (input.tolerance) {
    const band = referenceBand(targetPa, first, input.tolerance, ambientPa)
    result.low = show(band.low)
    result.high = show(band.high)
  }
  return result
}

export interface CorrectionCurveInput {
  reference: { pressure: Pressure, temperature: Temperature }
  tolerance?: Tolerance
  ambient?: Ambient
  model?: GasModel
  from: Temperature
  to: Temperature
  points?: number
}

export interface CorrectionCurveResult extends Provenance<CorrectionCurveInput> {
  /** Temperatures in the unit of `from`. */
  temperatures: number[]
  /** Values in the reference pressure's unit and basis. */
  target: number[]
  low?: number[]
  high?: number[]
}

/**
 * The charge target and band across a range of gas temperatures, for plotting: the same
 * constant-density correction as {@link chargeTarget}, evaluated at evenly spaced points.
 */
export function correctionCurve(input: CorrectionCurveInput): CorrectionCurveResult {
  const count = input.points ?? 126
  if (!(count >= 2 && count <= 2000)) throw new EngineInputError('A curve needs between 2 and 2000 points.', 'points')
  const model = input.model ?? 'real'
  const law = gasLaw(model)
  const ambientPa = ambientPressure(input.ambient)
  const { pressure, temperature } = input.reference
  const referencePa = pressureToPascalAbsolute(pressure, ambientPa)
  const referenceK = temperatureToKelvin(temperature)
  law.checkInput(referenceK, referencePa, 'reference.pressure')
  const fromK = temperatureToKelvin(input.from)
  const toK = temperatureToKelvin(input.to)
  law.checkInput(fromK, referencePa, 'from')
  law.checkInput(toK, referencePa, 'to')
  const band = input.tolerance ? referenceBand(referencePa, pressure, input.tolerance, ambientPa) : undefined
  const densities = [referencePa, band?.low, band?.high].map(pa =>
    pa === undefined ? undefined : law.density(pa, referenceK),
  )
  const lines: number[][] = [[], [], []]
  const temperatures: number[] = []
  for (let i = 0; i < count; i++) {
    const kelvin = fromK + ((toK - fromK) * i) / (count - 1)
    temperatures.push(kelvinToTemperature(kelvin, input.from.unit).value)
    densities.forEach((density, line) => {
      if (density === undefined) return
      const absolute = law.pressure(density, kelvin)
      lines[line]!.push((pressure.basis === 'gauge' ? absolute - ambientPa : absolute) / pascalsPerUnit(pressure))
    })
  }
  return {
    temperatures,
    target: lines[0]!,
    ...(band ? { low: lines[1], high: lines[2] } : {}),
    inputs: input,
    method: `${describeModel(model)}, constant gas mass and volume, ${count} points`,
    engineVersion: ENGINE_VERSION,
  }
}

function pascalsPerUnit(pressure: Pressure): number {
  return pressureDifferenceToPascal(1, pressure.unit)
}

export type Verdict = 'in-limits' | 'low' | 'high'

export interface ReadingAssessmentInput {
  reading: Pressure
  target: Pressure
  low: Pressure
  high: Pressure
  /** The gauge's accuracy as ± in a pressure unit; a reading this close to a limit is flagged. */
  gaugeAccuracy?: { value: number, unit: PressureUnit }
  ambient?: Ambient
}

export interface ReadingAssessment extends Provenance<ReadingAssessmentInput> {
  verdict: Verdict
  /** Reading minus target, in the target's unit. */
  difference: number
  /** Reading outside the band by this much (0 when in limits), in the target's unit. */
  outsideBy: number
  /** True when the reading lies within the gauge accuracy of a limit. */
  nearLimit: boolean
  warnings: string[]
}

/**
 * Compares a gauge reading with the target and band at the same gas temperature. All three
 * are brought to the target's unit and basis first; the difference is reading − target.
 */
export function assessReading(input: ReadingAssessmentInput): ReadingAssessment {
  const ambientPa = ambientPressure(input.ambient)
  const { target } = input
  const inTargetUnit = (pressure: Pressure) =>
    pascalAbsoluteToPressure(pressureToPascalAbsolute(pressure, ambientPa), target.unit, target.basis, ambientPa).value
  const reading = inTargetUnit(input.reading)
  const low = inTargetUnit(input.low)
  const high = inTargetUnit(input.high)
  const verdict: Verdict = reading < low ? 'low' : reading > high ? 'high' : 'in-limits'
  const accuracy = input.gaugeAccuracy
    ? pressureDifferenceToPascal(input.gaugeAccuracy.value, input.gaugeAccuracy.unit)
    / pressureDifferenceToPascal(1, target.unit)
    : 0
  const nearLimit = accuracy > 0 && (Math.abs(reading - low) <= accuracy || Math.abs(reading - high) <= accuracy)
  const warnings: string[] = []
  if (nearLimit) {
    warnings.push(
      `The reading is within the gauge accuracy (±${accuracy.toFixed(1)} ${target.unit}) of a limit: the verdict could go either way on this gauge.`,
    )
  }
  return {
    verdict,
    difference: reading - inTargetUnit(target),
    outsideBy: verdict === 'low' ? low - reading : verdict === 'high' ? reading - high : 0,
    nearLimit,
    warnings,
    inputs: input,
    method: 'reading compared with the band at the same gas temperature',
    engineVersion: ENGINE_VERSION,
  }
}
