import { ambientPressure, describeAmbient } from './atmosphere'
import { chargeTarget } from './charge-target'
import { EngineInputError } from './errors'
import { formatPressure, formatTemperature } from './format'
import { describeModel, gasLaw, stateAt } from './gas-law'
import type {
  Ambient,
  GasModel,
  Interval,
  IntervalUnit,
  Pressure,
  Provenance,
  Temperature,
  Tolerance,
  Volume,
  VolumeUnit,
} from './types'
import {
  cubicMetresToVolume,
  intervalToSeconds,
  pascalAbsoluteToPressure,
  pressureToPascalAbsolute,
  secondsToInterval,
  temperatureToKelvin,
  volumeToCubicMetres,
} from './units'
import { ENGINE_VERSION } from './version'

export interface CycleConditions {
  gasVolume: Volume
  precharge: Pressure
  prechargeTemperature: Temperature
  /** Fluid (and so gas) temperature during the check. */
  temperature: Temperature
  cutOut: Pressure
  cutIn: Pressure
  ambient?: Ambient
  model?: GasModel
}

/** A volume per minute, in a volume unit. */
export interface FlowRate {
  value: number
  unit: `${VolumeUnit}/min`
}

/**
 * Fluid the accumulator gives up as the pressure falls from cut-out to cut-in. The fall is
 * slow, so the gas expands isothermally at the check temperature (Boyle's law for the ideal
 * model, the nitrogen equation of state for the real one).
 */
function fluidBetweenCutOutAndCutIn(input: CycleConditions): {
  releasedM3: number
  warnings: string[]
  method: string
} {
  const law = gasLaw(input.model ?? 'real')
  const ambientPa = ambientPressure(input.ambient)
  const prechargePa = pressureToPascalAbsolute(input.precharge, ambientPa)
  const prechargeK = temperatureToKelvin(input.prechargeTemperature)
  const checkK = temperatureToKelvin(input.temperature)
  const cutOutPa = pressureToPascalAbsolute(input.cutOut, ambientPa)
  const cutInPa = pressureToPascalAbsolute(input.cutIn, ambientPa)
  law.checkInput(prechargeK, prechargePa, 'precharge')
  law.checkInput(checkK, cutOutPa, 'cutOut')
  law.checkInput(checkK, cutInPa, 'cutIn')
  if (cutInPa >= cutOutPa) {
    throw new EngineInputError(
      `The cut-in pressure (${formatPressure(input.cutIn)}) must be below the cut-out pressure (${formatPressure(input.cutOut)}).`,
      'cutIn',
    )
  }
  const gasM3 = volumeToCubicMetres(input.gasVolume)
  if (!(gasM3 > 0)) throw new EngineInputError('The gas volume must be above zero.', 'gasVolume')
  const mass = stateAt(law, prechargePa, prechargeK).density * gasM3
  const prechargeNowPa = law.pressure(mass / gasM3, checkK)
  if (prechargeNowPa >= cutOutPa) {
    throw new EngineInputError(
      'At this temperature the pre-charge is at or above the cut-out pressure: the accumulator holds no fluid between cut-out and cut-in.',
      'precharge',
    )
  }
  const warnings: string[] = []
  const atCutOut = mass / law.density(cutOutPa, checkK)
  let atCutIn = mass / law.density(cutInPa, checkK)
  if (atCutIn > gasM3) {
    atCutIn = gasM3
    warnings.push(
      'The cut-in pressure is below the pre-charge at this temperature: the accumulator is empty of fluid before cut-in, so the leak rate is a lower bound.',
    )
  }
  return {
    releasedM3: atCutIn - atCutOut,
    warnings,
    method: `${describeModel(law.model)}; isothermal expansion between cut-out and cut-in at the check temperature; ${describeAmbient(input.ambient)}`,
  }
}

export interface LeakRateInput extends CycleConditions {
  interval: Interval
}

export interface LeakRateResult extends Provenance<LeakRateInput> {
  fluidReleased: Volume
  leakRate: FlowRate
  warnings: string[]
}

/** The fluid leak rate implied by the time from pump cut-out to cut-in with no service selected. */
export function leakRate(input: LeakRateInput): LeakRateResult {
  const seconds = intervalToSeconds(input.interval)
  if (!(seconds > 0)) throw new EngineInputError('The interval must be above zero.', 'interval')
  const { releasedM3, warnings, method } = fluidBetweenCutOutAndCutIn(input)
  const unit = input.gasVolume.unit
  const released = cubicMetresToVolume(releasedM3, unit)
  return {
    fluidReleased: released,
    leakRate: { value: released.value / (seconds / 60), unit: `${unit}/min` },
    warnings,
    inputs: input,
    method,
    engineVersion: ENGINE_VERSION,
  }
}

/** A leak rate as a volume per time: what `leakRate` answers (per minute), or per second or hour. */
export interface FlowRateInput {
  value: number
  unit: `${VolumeUnit}/${'s' | 'min' | 'h'}`
}

export interface LeakIntervalInput extends CycleConditions {
  leakRate: FlowRateInput
  intervalUnit?: IntervalUnit
}

export interface LeakIntervalResult extends Provenance<LeakIntervalInput> {
  fluidReleased: Volume
  interval: Interval
  warnings: string[]
}

/** The cut-out to cut-in interval that a given leak rate (volume per minute) would give. */
export function leakInterval(input: LeakIntervalInput): LeakIntervalResult {
  const [volumeUnit, per] = input.leakRate.unit.split('/') as [VolumeUnit, 's' | 'min' | 'h']
  const perMinuteM3
    = volumeToCubicMetres({ value: input.leakRate.value, unit: volumeUnit }) * { s: 60, min: 1, h: 1 / 60 }[per]
  if (!(perMinuteM3 > 0)) throw new EngineInputError('The leak rate must be above zero.', 'leakRate')
  const { releasedM3, warnings, method } = fluidBetweenCutOutAndCutIn(input)
  return {
    fluidReleased: cubicMetresToVolume(releasedM3, input.gasVolume.unit),
    interval: secondsToInterval((releasedM3 / perMinuteM3) * 60, input.intervalUnit ?? 'min'),
    warnings,
    inputs: input,
    method,
    engineVersion: ENGINE_VERSION,
  }
}

export interface PrechargeReading {
  /** ISO date or date-time of the reading. */
  takenAt: string
  pressure: Pressure
  temperature: Temperature
  /** The local atmosphere when it was taken; defaults to the trend's. */
  ambient?: Ambient
  /** True for the as-left after a charge or vent: the gas mass changed, so a new segment starts here. */
  startsSegment?: boolean
}

export interface PrechargeTrendInput {
  readings: PrechargeReading[]
  reference: { pressure: Pressure, temperature: Temperature }
  tolerance?: Tolerance
  ambient?: Ambient
  model?: GasModel
}

/** The fitted loss trend of a unit, whichever way its readings were carried to the reference. */
export interface PrechargeFit {
  /** Each reading carried to the reference temperature, in the reference pressure's unit and basis, oldest first. */
  normalised: { takenAt: string, value: number, segment: number }[]
  /** Fitted change, pressure units per day (negative: losing gas); undefined without two readings in one segment. */
  lossRatePerDay?: number
  /** Standard error of that slope, same units. */
  lossRateStandardError?: number
  /** Readings and segments the slope was fitted on. */
  fit?: { readings: number, segments: number, degreesOfFreedom: number }
  /** Where the fitted line for the latest segment stands today and when it crosses the low limit, if it is falling. */
  predictedOutOfLimitsAt?: string
  lowLimit?: number
  highLimit?: number
  method: string
  engineVersion: string
}

export interface PrechargeTrendResult extends PrechargeFit, Provenance<PrechargeTrendInput> {}

/** Readings already carried to the reference temperature (as stored when each worksheet was released). */
export interface NormalisedReading {
  takenAt: string
  /** Pressure at the reference temperature, in the reference pressure's unit and basis. */
  value: number
  startsSegment?: boolean
}

export interface PrechargeFitInput {
  points: NormalisedReading[]
  reference: { pressure: Pressure, temperature: Temperature }
  tolerance?: Tolerance
  ambient?: Ambient
  model?: GasModel
}

const DAY_MS = 86_400_000

function trendMethod(model: GasModel, reference: { temperature: Temperature }): string {
  return `${describeModel(model)}: readings carried to ${formatTemperature(reference.temperature)} at constant gas mass and volume; one least-squares loss rate across charge segments`
}

/**
 * One reading carried to the reference temperature at constant gas mass and volume (Gay-Lussac
 * for the ideal gas, the nitrogen equation of state for the real one), in the reference
 * pressure's unit and basis: what the gas would read at the reference temperature.
 */
export function normalisePrechargeReading(
  reading: Pick<PrechargeReading, 'pressure' | 'temperature' | 'ambient'>,
  reference: { pressure: Pressure, temperature: Temperature },
  model: GasModel = 'real',
  ambient?: Ambient,
): number {
  const atmosphere = reading.ambient ?? ambient
  const carried = chargeTarget({
    reference: { pressure: reading.pressure, temperature: reading.temperature },
    gasTemperature: reference.temperature,
    ambient: atmosphere,
    model,
  }).target
  return sameUnit(carried, reference.pressure, atmosphere)
}

/**
 * The pre-charge loss rate from a unit's readings. Each reading is carried to the reference
 * temperature at constant gas mass and volume, so temperature swings are not taken for a
 * leak. A charge or vent changes the gas mass and starts a new segment; one common slope is
 * fitted across segments, each with its own level (see `fitPrechargeTrend`).
 */
export function prechargeTrend(input: PrechargeTrendInput): PrechargeTrendResult {
  const model = input.model ?? 'real'
  const points = input.readings.map((reading, index) => {
    if (Number.isNaN(Date.parse(reading.takenAt)))
      throw new EngineInputError('A reading has no valid date.', `readings.${index}.takenAt`)
    return {
      takenAt: reading.takenAt,
      value: normalisePrechargeReading(reading, input.reference, model, input.ambient),
      startsSegment: reading.startsSegment,
    }
  })
  return {
    ...fitPrechargeTrend({
      points,
      reference: input.reference,
      tolerance: input.tolerance,
      ambient: input.ambient,
      model,
    }),
    inputs: input,
  }
}

/**
 * The common loss rate of readings already carried to the reference temperature: the least
 * squares fit of one slope with a separate level per charge segment (the analysis-of-covariance
 * pooled within-segment slope), in closed form: slope = Σ(t − t̄ₛ)(p − p̄ₛ) / Σ(t − t̄ₛ)², with
 * standard error s/√Σ(t − t̄ₛ)², s² = Σresidual²/(n − k − 1) for n readings in k fitted
 * segments (Draper and Smith, Applied Regression Analysis, 3rd ed., §14, from memory).
 * Linear in the number of readings.
 */
export function fitPrechargeTrend(input: PrechargeFitInput): PrechargeFit & Provenance<PrechargeFitInput> {
  const model = input.model ?? 'real'
  const { reference } = input
  const ordered = input.points
    .map((point, index) => {
      const time = Date.parse(point.takenAt)
      if (Number.isNaN(time)) throw new EngineInputError('A reading has no valid date.', `points.${index}.takenAt`)
      return { point, index, time }
    })
    .sort((a, b) => a.time - b.time || a.index - b.index)
  let segment = 0
  const normalised = ordered.map(({ point }, order) => {
    if (point.startsSegment && order > 0) segment++
    return { takenAt: point.takenAt, value: point.value, segment }
  })
  const result: PrechargeFit & Provenance<PrechargeFitInput> = {
    normalised,
    inputs: input,
    method: trendMethod(model, reference),
    engineVersion: ENGINE_VERSION,
  }
  if (input.tolerance) {
    const band = chargeTarget({
      reference,
      gasTemperature: reference.temperature,
      tolerance: input.tolerance,
      ambient: input.ambient,
      model,
    })
    result.lowLimit = band.low!.value
    result.highLimit = band.high!.value
  }
  if (ordered.length === 0) return result
  const origin = ordered[0]!.time
  const days = ordered.map(({ time }) => (time - origin) / DAY_MS)
  // Per segment: count and means, one pass.
  const sums = new Map<number, { n: number, day: number, value: number }>()
  normalised.forEach((point, index) => {
    const sum = sums.get(point.segment) ?? { n: 0, day: 0, value: 0 }
    sum.n++
    sum.day += days[index]!
    sum.value += point.value
    sums.set(point.segment, sum)
  })
  let sxx = 0
  let sxy = 0
  let fitted = 0
  normalised.forEach((point, index) => {
    const sum = sums.get(point.segment)!
    if (sum.n < 2) return
    const x = days[index]! - sum.day / sum.n
    sxx += x * x
    sxy += x * (point.value - sum.value / sum.n)
    fitted++
  })
  if (fitted < 2 || sxx === 0) return result
  const slope = sxy / sxx
  const fittedSegments = [...sums.values()].filter(sum => sum.n > 1).length
  const degreesOfFreedom = fitted - fittedSegments - 1
  result.lossRatePerDay = slope
  result.fit = { readings: fitted, segments: fittedSegments, degreesOfFreedom }
  if (degreesOfFreedom > 0) {
    let residualSquares = 0
    normalised.forEach((point, index) => {
      const sum = sums.get(point.segment)!
      if (sum.n < 2) return
      residualSquares += (point.value - sum.value / sum.n - slope * (days[index]! - sum.day / sum.n)) ** 2
    })
    result.lossRateStandardError = Math.sqrt(residualSquares / degreesOfFreedom / sxx)
  }
  const latest = sums.get(segment)!
  if (result.lowLimit !== undefined && slope < 0) {
    const centreDay = latest.day / latest.n
    const crossingDay = centreDay + (result.lowLimit - latest.value / latest.n) / slope
    // Beyond fifty years a forecast says nothing useful (and leaves the range of a date).
    if (crossingDay - centreDay < 50 * 365)
      result.predictedOutOfLimitsAt = new Date(origin + crossingDay * DAY_MS).toISOString()
  }
  return result
}

function sameUnit(pressure: Pressure, like: Pressure, ambient?: Ambient): number {
  const ambientPa = ambientPressure(ambient)
  return pascalAbsoluteToPressure(pressureToPascalAbsolute(pressure, ambientPa), like.unit, like.basis, ambientPa).value
}
