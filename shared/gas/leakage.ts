import { mean } from 'mathjs'
import { ambientPressure, describeAmbient } from './atmosphere'
import { chargeTarget } from './charge-target'
import { EngineInputError } from './errors'
import { formatPressure } from './format'
import { describeModel, gasLaw, stateAt } from './gas-law'
import type {
  Ambient, GasModel, Interval, IntervalUnit, Pressure, Provenance, Temperature, Tolerance, Volume, VolumeUnit,
} from './types'
import {
  cubicMetresToVolume, intervalToSeconds, pascalAbsoluteToPressure, pressureToPascalAbsolute,
  secondsToInterval, temperatureToKelvin, volumeToCubicMetres,
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
export interface FlowRate { value: number, unit: `${VolumeUnit}/min` }

/**
 * Fluid the accumulator gives up as the pressure falls from cut-out to cut-in. The fall is
 * slow, so the gas expands isothermally at the check temperature (Boyle's law for the ideal
 * model, the nitrogen equation of state for the real one).
 */
function fluidBetweenCutOutAndCutIn(input: CycleConditions): { releasedM3: number, warnings: string[], method: string } {
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
    throw new EngineInputError(`The cut-in pressure (${formatPressure(input.cutIn)}) must be below the cut-out pressure (${formatPressure(input.cutOut)}).`, 'cutIn')
  }
  const gasM3 = volumeToCubicMetres(input.gasVolume)
  if (!(gasM3 > 0)) throw new EngineInputError('The gas volume must be above zero.', 'gasVolume')
  const mass = stateAt(law, prechargePa, prechargeK).density * gasM3
  const prechargeNowPa = law.pressure(mass / gasM3, checkK)
  if (prechargeNowPa >= cutOutPa) {
    throw new EngineInputError('At this temperature the pre-charge is at or above the cut-out pressure: the accumulator holds no fluid between cut-out and cut-in.', 'precharge')
  }
  const warnings: string[] = []
  const atCutOut = mass / law.density(cutOutPa, checkK)
  let atCutIn = mass / law.density(cutInPa, checkK)
  if (atCutIn > gasM3) {
    atCutIn = gasM3
    warnings.push('The cut-in pressure is below the pre-charge at this temperature: the accumulator is empty of fluid before cut-in, so the leak rate is a lower bound.')
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

export interface LeakIntervalInput extends CycleConditions {
  leakRate: { value: number, unit: VolumeUnit }
  intervalUnit?: IntervalUnit
}

export interface LeakIntervalResult extends Provenance<LeakIntervalInput> {
  fluidReleased: Volume
  interval: Interval
  warnings: string[]
}

/** The cut-out to cut-in interval that a given leak rate (volume per minute) would give. */
export function leakInterval(input: LeakIntervalInput): LeakIntervalResult {
  const perMinuteM3 = volumeToCubicMetres({ value: input.leakRate.value, unit: input.leakRate.unit })
  if (!(perMinuteM3 > 0)) throw new EngineInputError('The leak rate must be above zero.', 'leakRate')
  const { releasedM3, warnings, method } = fluidBetweenCutOutAndCutIn(input)
  return {
    fluidReleased: cubicMetresToVolume(releasedM3, input.gasVolume.unit),
    interval: secondsToInterval(releasedM3 / perMinuteM3 * 60, input.intervalUnit ?? 'min'),
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
}

export interface PrechargeTrendInput {
  readings: PrechargeReading[]
  reference: { pressure: Pressure, temperature: Temperature }
  tolerance?: Tolerance
  ambient?: Ambient
  model?: GasModel
}

export interface PrechargeTrendResult extends Provenance<PrechargeTrendInput> {
  /** Each reading carried to the reference temperature, in the reference pressure's unit and basis. */
  normalised: { takenAt: string, value: number }[]
  /** Least-squares slope, pressure units per day (negative: losing gas); undefined with fewer than two readings. */
  lossRatePerDay?: number
  /** Standard error of the slope, same units. */
  lossRateStandardError?: number
  /** When the fitted line crosses the low end of the band, if it is falling. */
  predictedOutOfLimitsAt?: string
  lowLimit?: number
}

const DAY_MS = 86_400_000

/**
 * The pre-charge loss rate from a unit's readings: each reading is carried to the reference
 * temperature at constant gas mass and volume (so temperature swings are not mistaken for a
 * leak), then an ordinary least-squares line is fitted against time; the slope's standard
 * error is s/√Σ(t−t̄)² with s² = Σresidual²/(n−2).
 */
export function prechargeTrend(input: PrechargeTrendInput): PrechargeTrendResult {
  const model = input.model ?? 'real'
  const reference = input.reference
  const normalised = input.readings.map((reading, index) => {
    if (Number.isNaN(Date.parse(reading.takenAt))) throw new EngineInputError('A reading has no valid date.', `readings.${index}.takenAt`)
    const carried = chargeTarget({
      reference: { pressure: reading.pressure, temperature: reading.temperature },
      gasTemperature: reference.temperature,
      ambient: input.ambient,
      model,
    }).target
    return { takenAt: reading.takenAt, value: sameUnit(carried, reference.pressure, input.ambient) }
  }).sort((a, b) => Date.parse(a.takenAt) - Date.parse(b.takenAt))

  const result: PrechargeTrendResult = {
    normalised,
    inputs: input,
    method: `${describeModel(model)}: readings carried to ${reference.temperature.value} °${reference.temperature.unit} at constant gas mass and volume; ordinary least squares against time`,
    engineVersion: ENGINE_VERSION,
  }
  if (input.tolerance) {
    result.lowLimit = chargeTarget({ reference, gasTemperature: reference.temperature, tolerance: input.tolerance, ambient: input.ambient, model }).low!.value
  }
  if (normalised.length < 2) return result
  const days = normalised.map(point => (Date.parse(point.takenAt) - Date.parse(normalised[0]!.takenAt)) / DAY_MS)
  const values = normalised.map(point => point.value)
  const dayMean = mean(days) as number
  const valueMean = mean(values) as number
  const sxx = days.reduce((total, day) => total + (day - dayMean) ** 2, 0)
  const sxy = days.reduce((total, day, i) => total + (day - dayMean) * (values[i]! - valueMean), 0)
  if (sxx === 0) return result
  const slope = sxy / sxx
  const intercept = valueMean - slope * dayMean
  result.lossRatePerDay = slope
  if (normalised.length > 2) {
    const residualSquares = days.reduce((total, day, i) => total + (values[i]! - intercept - slope * day) ** 2, 0)
    result.lossRateStandardError = Math.sqrt(residualSquares / (normalised.length - 2) / sxx)
  }
  if (result.lowLimit !== undefined && slope < 0) {
    const crossingDay = (result.lowLimit - intercept) / slope
    result.predictedOutOfLimitsAt = new Date(Date.parse(normalised[0]!.takenAt) + crossingDay * DAY_MS).toISOString()
  }
  return result
}

function sameUnit(pressure: Pressure, like: Pressure, ambient?: Ambient): number {
  const ambientPa = ambientPressure(ambient)
  return pascalAbsoluteToPressure(pressureToPascalAbsolute(pressure, ambientPa), like.unit, like.basis, ambientPa).value
}
