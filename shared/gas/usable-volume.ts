import { ambientPressure, describeAmbient } from './atmosphere'
import { EngineInputError } from './errors'
import { formatPressure } from './format'
import {
  changeToDensity,
  changeToPressure,
  describeModel,
  describeProcess,
  gasLaw,
  stateAt,
  stateAtTemperature,
  type GasLaw,
  type GasState,
} from './gas-law'
import type { Ambient, GasModel, Pressure, Process, Provenance, Temperature, Volume, VolumeUnit } from './types'
import {
  cubicMetresToVolume,
  kelvinToTemperature,
  pascalAbsoluteToPressure,
  pressureToPascalAbsolute,
  temperatureToKelvin,
  volumeToCubicMetres,
} from './units'
import { ENGINE_VERSION } from './version'

/** Working limits and processes shared by the sizing calculations. */
export interface SizingConditions {
  precharge: Pressure
  prechargeTemperature: Temperature
  operatingTemperature?: Temperature
  maxPressure: Pressure
  minPressure: Pressure
  charge?: Process
  discharge?: Process
  perApplication?: Volume
  ambient?: Ambient
  model?: GasModel
}

export interface UsableVolumeInput extends SizingConditions {
  gasVolume: Volume
}

export interface UsableVolumeResult extends Provenance<UsableVolumeInput> {
  prechargeAtOperatingTemperature: Pressure
  gasVolumeAtMax: Volume
  gasVolumeAtMin: Volume
  usableVolume: Volume
  /** Gas temperature at maximum pressure and at the end of the discharge, in the operating temperature's unit. */
  temperatureAtMax: Temperature
  temperatureAtMin: Temperature
  applications?: number
  residualPressure?: Pressure
  /** Where the separator bottoms out before the minimum pressure: the pressure when it does. */
  bottomOutPressure?: Pressure
  warnings: string[]
}

/** Everything in SI, as the core works on it. */
interface SiConditions {
  law: GasLaw
  ambientPa: number
  prechargePa: number
  prechargeK: number
  operatingK: number
  maxPa: number
  minPa: number
  charge: Process
  discharge: Process
}

interface SiOutcome {
  /** Fractions of the gas volume at pre-charge. */
  atMaxFraction: number
  atMinFraction: number
  usableFraction: number
  operating: GasState
  atMax: GasState
  atMin: GasState
  bottomOut?: GasState
}

function toSi(input: SizingConditions): SiConditions {
  const law = gasLaw(input.model ?? 'real')
  const ambientPa = ambientPressure(input.ambient)
  const si: SiConditions = {
    law,
    ambientPa,
    prechargePa: pressureToPascalAbsolute(input.precharge, ambientPa),
    prechargeK: temperatureToKelvin(input.prechargeTemperature),
    operatingK: temperatureToKelvin(input.operatingTemperature ?? input.prechargeTemperature),
    maxPa: pressureToPascalAbsolute(input.maxPressure, ambientPa),
    minPa: pressureToPascalAbsolute(input.minPressure, ambientPa),
    charge: input.charge ?? 'isothermal',
    discharge: input.discharge ?? 'adiabatic',
  }
  law.checkInput(si.prechargeK, si.prechargePa, 'precharge')
  law.checkInput(si.operatingK, si.maxPa, input.operatingTemperature ? 'operatingTemperature' : 'prechargeTemperature')
  law.checkInput(si.operatingK, si.minPa, 'minPressure')
  if (si.minPa >= si.maxPa) {
    throw new EngineInputError(
      `The minimum working pressure (${formatPressure(input.minPressure)}) must be below the maximum (${formatPressure(input.maxPressure)}).`,
      'minPressure',
    )
  }
  return si
}

/**
 * A gas state the method cannot reach (outside the equation of state's range) is refused naming the input
 * that leads there: the pre-charge, the operating temperature, the maximum (charge) or the minimum
 * (discharge) pressure.
 */
function naming<T>(field: string, calculation: () => T): T {
  try {
    return calculation()
  }
  catch (error) {
    if (error instanceof EngineInputError && !error.field) throw new EngineInputError(error.message, field)
    throw error
  }
}

/**
 * The core of every sizing figure, per unit of gas volume: the gas mass is fixed by the
 * pre-charge at its temperature, brought to the operating temperature at constant volume,
 * compressed to the maximum pressure by the charge process, then expanded from that state
 * towards the minimum pressure by the discharge process; the separator stops the gas at its
 * pre-charge volume.
 */
function sizeSi(si: SiConditions): SiOutcome {
  const { law } = si
  const filled = naming('precharge', () => stateAt(law, si.prechargePa, si.prechargeK))
  const operating = naming('operatingTemperature', () => stateAtTemperature(law, filled, si.operatingK))
  if (operating.pressure >= si.maxPa) {
    throw new EngineInputError(
      'At the operating temperature the pre-charge reaches the maximum working pressure: no fluid would enter the accumulator. Lower the pre-charge.',
      'precharge',
    )
  }
  const atMax = naming('maxPressure', () => changeToPressure(law, si.charge, operating, si.maxPa))
  let atMin = naming('minPressure', () => changeToPressure(law, si.discharge, atMax, si.minPa))
  let bottomOut: GasState | undefined
  if (atMin.density < filled.density) {
    bottomOut = naming('minPressure', () => changeToDensity(law, si.discharge, atMax, filled.density))
    atMin = bottomOut
  }
  const atMaxFraction = filled.density / atMax.density
  const atMinFraction = filled.density / atMin.density
  return {
    atMaxFraction,
    atMinFraction,
    usableFraction: atMinFraction - atMaxFraction,
    operating,
    atMax,
    atMin,
    bottomOut,
  }
}

function methodText(si: SiConditions, ambient?: Ambient): string {
  return `${describeModel(si.law.model)}; charge ${describeProcess(si.charge, si.law.model)}, discharge ${describeProcess(si.discharge, si.law.model)}; ${describeAmbient(ambient)}`
}

/**
 * Usable fluid volume between the maximum and minimum working pressures, and, given a volume
 * per application, the number of whole applications and the pressure after the last one.
 * State changes by Boyle/polytropic laws (ideal) or the nitrogen equation of state (real).
 */
export function usableVolume(input: UsableVolumeInput): UsableVolumeResult {
  const si = toSi(input)
  return usableFromOutcome(input, si, sizeSi(si))
}

/** The usable-volume answer from a sizing already done (the inverse reuses its own). */
function usableFromOutcome(input: UsableVolumeInput, si: SiConditions, outcome: SiOutcome): UsableVolumeResult {
  const gasM3 = volumeToCubicMetres(input.gasVolume)
  if (!(gasM3 > 0)) throw new EngineInputError('The gas volume must be above zero.', 'gasVolume')
  const unit = input.gasVolume.unit
  const temperatureUnit = (input.operatingTemperature ?? input.prechargeTemperature).unit
  const showPressure = (pa: number, like: Pressure) => pascalAbsoluteToPressure(pa, like.unit, like.basis, si.ambientPa)
  const showTemperature = (kelvin: number) => kelvinToTemperature(kelvin, temperatureUnit)
  const warnings: string[] = []
  const usableM3 = outcome.usableFraction * gasM3
  const result: UsableVolumeResult = {
    prechargeAtOperatingTemperature: showPressure(outcome.operating.pressure, input.precharge),
    gasVolumeAtMax: cubicMetresToVolume(outcome.atMaxFraction * gasM3, unit),
    gasVolumeAtMin: cubicMetresToVolume(outcome.atMinFraction * gasM3, unit),
    usableVolume: cubicMetresToVolume(usableM3, unit),
    temperatureAtMax: showTemperature(outcome.atMax.temperature),
    temperatureAtMin: showTemperature(outcome.atMin.temperature),
    warnings,
    inputs: input,
    method: methodText(si, input.ambient),
    engineVersion: ENGINE_VERSION,
  }
  if (outcome.operating.pressure > si.minPa) {
    warnings.push(
      `The pre-charge at operating temperature (${formatPressure(result.prechargeAtOperatingTemperature)}) is above the minimum working pressure (${formatPressure(input.minPressure)}).`,
    )
  }
  if (outcome.bottomOut) {
    result.bottomOutPressure = showPressure(outcome.bottomOut.pressure, input.minPressure)
    warnings.push(
      `The separator bottoms out at ${formatPressure(result.bottomOutPressure)}, before the pressure falls to the minimum: the gas volume at minimum is the full gas volume.`,
    )
  }
  if (input.perApplication) {
    const perM3 = volumeToCubicMetres(input.perApplication)
    if (!(perM3 > 0)) throw new EngineInputError('The volume per application must be above zero.', 'perApplication')
    const applications = Math.floor((usableM3 / perM3) * (1 + 1e-12) + 1e-12)
    result.applications = applications
    const afterM3 = outcome.atMaxFraction * gasM3 + applications * perM3
    const filledDensity = outcome.atMax.density * outcome.atMaxFraction
    const after
      = applications === 0
        ? outcome.atMax
        : changeToDensity(si.law, si.discharge, outcome.atMax, (filledDensity * gasM3) / afterM3)
    result.residualPressure = showPressure(after.pressure, input.minPressure)
  }
  return result
}

export interface RequiredVolumeInput extends SizingConditions {
  usable?: Volume
  applications?: number
}

export interface RequiredVolumeResult extends Provenance<RequiredVolumeInput> {
  gasVolume: Volume
  /** The forward calculation at the gas volume found, as a check. */
  check: UsableVolumeResult
}

/**
 * The gas volume (at the pre-charge) that delivers a usable volume or a number of
 * applications. A fixed gas mass per unit volume makes every volume in the forward
 * calculation proportional to the gas volume, so the inverse is exact.
 */
export function requiredVolume(input: RequiredVolumeInput): RequiredVolumeResult {
  const si = toSi(input)
  let neededM3: number
  let unit: VolumeUnit
  if (input.usable) {
    neededM3 = volumeToCubicMetres(input.usable)
    unit = input.usable.unit
  }
  else if (input.applications !== undefined && input.perApplication) {
    neededM3 = input.applications * volumeToCubicMetres(input.perApplication)
    unit = input.perApplication.unit
  }
  else {
    throw new EngineInputError(
      'Give either a usable volume, or a number of applications with a volume per application.',
      'usable',
    )
  }
  if (!(neededM3 > 0))
    throw new EngineInputError('The volume to deliver must be above zero.', input.usable ? 'usable' : 'applications')
  const outcome = sizeSi(si)
  const gasVolume = cubicMetresToVolume(neededM3 / outcome.usableFraction, unit)
  // The check at the gas volume found reuses the one sizing: every volume scales with the gas volume.
  const check = usableFromOutcome({ ...input, gasVolume }, si, outcome)
  return {
    gasVolume,
    check,
    inputs: input,
    method: `inverse of the usable volume; ${methodText(si, input.ambient)}`,
    engineVersion: ENGINE_VERSION,
  }
}

export interface OptimumPrechargeInput extends Omit<SizingConditions, 'precharge'> {
  gasVolume: Volume
  /** Unit and basis for the answer; defaults to the maximum pressure's. */
  prechargeUnit?: Pick<Pressure, 'unit' | 'basis'>
}

export interface OptimumPrechargeResult extends Provenance<OptimumPrechargeInput> {
  /** The pre-charge, at the pre-charge temperature, that gives the most usable fluid. */
  precharge: Pressure
  /** The same gas at the operating temperature. */
  prechargeAtOperatingTemperature: Pressure
  usableVolume: Volume
  /** The pre-charges searched (at the pre-charge temperature): every one that lets fluid in when operating. */
  searched: { low: Pressure, high: Pressure }
  /** True when the best lies at an end of the searched range (the usable volume may go on rising beyond it). */
  atBound: boolean
  warnings: string[]
}

/**
 * The physically feasible pre-charges (absolute, Pa, at the pre-charge temperature): above the ambient
 * pressure, and low enough that at the operating temperature the gas is below the maximum working
 * pressure (the same gas at constant volume: the same density).
 */
function feasiblePrecharges(input: Omit<SizingConditions, 'precharge'>): { lowPa: number, highPa: number, ambientPa: number } {
  const ambientPa = ambientPressure(input.ambient)
  const law = gasLaw(input.model ?? 'real')
  const prechargeK = temperatureToKelvin(input.prechargeTemperature)
  const operatingK = temperatureToKelvin(input.operatingTemperature ?? input.prechargeTemperature)
  const maxPa = pressureToPascalAbsolute(input.maxPressure, ambientPa)
  law.checkInput(prechargeK, maxPa, 'prechargeTemperature')
  law.checkInput(operatingK, maxPa, input.operatingTemperature ? 'operatingTemperature' : 'prechargeTemperature')
  const highPa = law.pressure(law.density(maxPa, operatingK), prechargeK)
  return { lowPa: ambientPa * 1.01, highPa: highPa * (1 - 1e-9), ambientPa }
}

/**
 * The pre-charge that maximises the usable volume for given limits, judged at the operating temperature
 * as the usable volume is. Usable volume rises with the pre-charge until the separator just reaches its
 * stop at the minimum pressure, then falls. The whole feasible range is scanned (240 points, evenly in
 * log pressure) and the best refined by golden-section search between its neighbours; a trial pre-charge
 * the method cannot compute (a gas state outside the equation of state's range) is skipped, not fatal.
 */
export function optimumPrecharge(input: OptimumPrechargeInput): OptimumPrechargeResult {
  const like = input.prechargeUnit ?? input.maxPressure
  const { lowPa, highPa, ambientPa } = feasiblePrecharges(input)
  if (!(highPa > lowPa)) {
    throw new EngineInputError(
      `At the operating temperature even a pre-charge at the ambient pressure reaches the maximum working pressure (${formatPressure(input.maxPressure)}).`,
      'maxPressure',
    )
  }
  let skipped: EngineInputError | undefined
  const probe = (pa: number): { si?: SiConditions, usable: number } => {
    try {
      const si = toSi({ ...input, precharge: { value: pa / 1000, unit: 'kPa', basis: 'absolute' } })
      return { si, usable: sizeSi(si).usableFraction }
    }
    catch (error) {
      if (!(error instanceof EngineInputError)) throw error
      skipped ??= error
      return { usable: Number.NEGATIVE_INFINITY }
    }
  }
  const steps = 240
  const at = (index: number) => Math.exp(Math.log(lowPa) + ((Math.log(highPa) - Math.log(lowPa)) * index) / steps)
  let bestIndex = -1
  let bestUsable = Number.NEGATIVE_INFINITY
  for (let index = 0; index <= steps; index++) {
    const usable = probe(at(index)).usable
    if (usable > bestUsable) {
      bestUsable = usable
      bestIndex = index
    }
  }
  if (bestIndex < 0) {
    throw new EngineInputError(
      `No pre-charge gives a state this method can compute: ${skipped?.message ?? 'check the limits.'}`,
      skipped?.field ?? 'minPressure',
    )
  }
  let low = at(Math.max(0, bestIndex - 1))
  let high = at(Math.min(steps, bestIndex + 1))
  const ratio = (Math.sqrt(5) - 1) / 2
  for (let iteration = 0; iteration < 100 && high - low > 1e-10 * high; iteration++) {
    const a = high - ratio * (high - low)
    const b = low + ratio * (high - low)
    if (probe(a).usable < probe(b).usable) low = a
    else high = b
  }
  let bestPa = (low + high) / 2
  let best = probe(bestPa)
  if (!(best.usable >= bestUsable)) {
    bestPa = at(bestIndex)
    best = probe(bestPa)
  }
  const gasM3 = volumeToCubicMetres(input.gasVolume)
  const show = (pa: number) => pascalAbsoluteToPressure(pa, like.unit, like.basis, ambientPa)
  const outcome = sizeSi(best.si!)
  const atBound = bestIndex === 0 || bestIndex === steps
  const warnings: string[] = []
  const precharge = show(bestPa)
  if (atBound) {
    warnings.push(
      `The best pre-charge lies at the ${bestIndex === 0 ? 'lower' : 'upper'} end of the feasible range (${formatPressure(show(bestIndex === 0 ? lowPa : highPa))}): the usable volume may go on ${bestIndex === 0 ? 'rising below' : 'rising above'} it.`,
    )
  }
  const maxPa = pressureToPascalAbsolute(input.maxPressure, ambientPa)
  if (bestPa >= maxPa) {
    warnings.push(
      `At the pre-charge temperature the best pre-charge (${formatPressure(precharge)}) is at or above the maximum working pressure (${formatPressure(input.maxPressure)}); it is lower only at the operating temperature. Charging that high needs the unit's rated limits.`,
    )
  }
  if (skipped) warnings.push(`Some trial pre-charges could not be computed and were skipped: ${skipped.message}`)
  return {
    precharge,
    prechargeAtOperatingTemperature:
      pascalAbsoluteToPressure(outcome.operating.pressure, like.unit, like.basis, ambientPa),
    usableVolume: cubicMetresToVolume(best.usable * gasM3, input.gasVolume.unit),
    searched: { low: show(lowPa), high: show(highPa) },
    atBound,
    warnings,
    inputs: input,
    method: `the usable volume over every feasible pre-charge (judged at the operating temperature), scanned and refined by golden-section search; ${methodText(best.si!, input.ambient)}`,
    engineVersion: ENGINE_VERSION,
  }
}

export interface EnvelopeInput extends Omit<UsableVolumeInput, 'operatingTemperature'> {
  temperatures: { label?: string, temperature: Temperature }[]
}

export interface EnvelopeResult extends Provenance<EnvelopeInput> {
  rows: ({ label?: string, temperature: Temperature } & (
    { result: UsableVolumeResult } | { error: string, field?: string }
  ))[]
}

/** The usable-volume calculation at each temperature of an envelope (cold soak, standard day, hot day …). */
export function usableVolumeEnvelope(input: EnvelopeInput): EnvelopeResult {
  const { temperatures, ...rest } = input
  const rows = temperatures.map(({ label, temperature }, index) => {
    try {
      return { label, temperature, result: usableVolume({ ...rest, operatingTemperature: temperature }) }
    }
    catch (error) {
      // The row's temperature is sent as temperatures[i].temperature, not as an operating temperature.
      const field = error instanceof EngineInputError && error.field === 'operatingTemperature'
        ? `temperatures.${index}.temperature`
        : (error as EngineInputError).field
      if (error instanceof EngineInputError) return { label, temperature, error: error.message, field }
      throw error
    }
  })
  return {
    rows,
    inputs: input,
    method: 'usable volume at each temperature of the envelope',
    engineVersion: ENGINE_VERSION,
  }
}

/**
 * Highest ratio of maximum working pressure to pre-charge (absolute) usually accepted per
 * accumulator type — common practice (no source): bladders about 4:1 (the bladder is
 * squeezed against the poppet beyond that), diaphragms about 8:1, pistons about 10:1
 * (seal friction and gas heating). The approved data and the maker's limits govern.
 */
export const COMPRESSION_RATIO_LIMITS = { bladder: 4, diaphragm: 8, piston: 10 } as const
export type AccumulatorKind = keyof typeof COMPRESSION_RATIO_LIMITS

/** Warnings on the compression ratio for an accumulator type (common practice limits). */
export function compressionRatioWarnings(
  result: UsableVolumeResult,
  kind: AccumulatorKind | undefined,
  ambient?: Ambient,
): string[] {
  if (!kind) return []
  const ambientPa = ambientPressure(ambient)
  const maxPa = pressureToPascalAbsolute(result.inputs.maxPressure, ambientPa)
  const prechargePa = pressureToPascalAbsolute(result.prechargeAtOperatingTemperature, ambientPa)
  const ratio = maxPa / prechargePa
  const limit = COMPRESSION_RATIO_LIMITS[kind]
  if (ratio <= limit) return []
  return [
    `Compression ratio ${ratio.toFixed(1)}:1 (maximum pressure to pre-charge, absolute) is beyond the usual ${limit}:1 for a ${kind} accumulator (common practice; the maker's limits govern).`,
  ]
}

export interface DischargeCurveInput extends UsableVolumeInput {
  points?: number
}

export interface DischargeCurveResult extends Provenance<DischargeCurveInput> {
  /** Fluid delivered from the maximum pressure, in the gas volume's unit. */
  delivered: number[]
  /** Gas pressure, in the minimum pressure's unit and basis. */
  pressure: number[]
  /** The pressure after each whole application, when a volume per application is given. */
  applications: { delivered: number, pressure: number }[]
}

/**
 * Gas pressure against fluid delivered along the discharge, from the maximum working pressure
 * to the minimum (or to where the separator bottoms out), for plotting, with each application
 * as a step.
 */
export function dischargeCurve(input: DischargeCurveInput): DischargeCurveResult {
  const count = input.points ?? 60
  if (!(count >= 2 && count <= 1000)) throw new EngineInputError('A curve needs between 2 and 1000 points.', 'points')
  const si = toSi(input)
  const outcome = sizeSi(si)
  const gasM3 = volumeToCubicMetres(input.gasVolume)
  const unit = input.gasVolume.unit
  const mass = outcome.atMax.density * outcome.atMaxFraction * gasM3
  const pressureAt = (deliveredM3: number) => {
    if (deliveredM3 === 0) return outcome.atMax.pressure
    const state = changeToDensity(
      si.law,
      si.discharge,
      outcome.atMax,
      mass / (outcome.atMaxFraction * gasM3 + deliveredM3),
    )
    return state.pressure
  }
  const show = (pa: number) =>
    pascalAbsoluteToPressure(pa, input.minPressure.unit, input.minPressure.basis, si.ambientPa).value
  const usableM3 = outcome.usableFraction * gasM3
  const delivered: number[] = []
  const pressure: number[] = []
  for (let i = 0; i < count; i++) {
    const deliveredM3 = (usableM3 * i) / (count - 1)
    delivered.push(cubicMetresToVolume(deliveredM3, unit).value)
    pressure.push(show(pressureAt(deliveredM3)))
  }
  const applications: DischargeCurveResult['applications'] = []
  if (input.perApplication) {
    const perM3 = volumeToCubicMetres(input.perApplication)
    for (let n = 1; n * perM3 <= usableM3 * (1 + 1e-12) && n <= 500; n++) {
      applications.push({
        delivered: cubicMetresToVolume(n * perM3, unit).value,
        pressure: show(pressureAt(n * perM3)),
      })
    }
  }
  return {
    delivered,
    pressure,
    applications,
    inputs: input,
    method: `discharge ${describeProcess(si.discharge, si.law.model)} from the maximum pressure; ${describeModel(si.law.model)}`,
    engineVersion: ENGINE_VERSION,
  }
}

export interface PrechargeSweepInput extends Omit<UsableVolumeInput, 'precharge'> {
  /** Unit and basis of the pre-charge axis; defaults to the minimum pressure's. */
  prechargeUnit?: Pick<Pressure, 'unit' | 'basis'>
  points?: number
}

export interface PrechargeSweepResult extends Provenance<PrechargeSweepInput> {
  /** Pre-charge at the pre-charge temperature. */
  precharge: number[]
  /** Usable volume, in the gas volume's unit; 0 where no fluid would enter. */
  usable: number[]
  optimum: { precharge: Pressure, usableVolume: Volume }
}

/**
 * Usable volume against pre-charge, from 20 % of the maximum working pressure to the highest pre-charge that
 * still lets fluid in at the operating temperature, with the optimum marked.
 */
export function prechargeSweep(input: PrechargeSweepInput): PrechargeSweepResult {
  const count = input.points ?? 50
  if (!(count >= 2 && count <= 500)) throw new EngineInputError('A sweep needs between 2 and 500 points.', 'points')
  const like = input.prechargeUnit ?? input.minPressure
  const { lowPa, highPa, ambientPa } = feasiblePrecharges(input)
  const maxPa = pressureToPascalAbsolute(input.maxPressure, ambientPa)
  const fromPa = Math.max(lowPa, Math.min(0.2 * maxPa, 0.2 * highPa))
  const precharge: number[] = []
  const usable: number[] = []
  for (let i = 0; i < count; i++) {
    const pa = fromPa + ((highPa - fromPa) * i) / (count - 1)
    const stated = pascalAbsoluteToPressure(pa, like.unit, like.basis, ambientPa)
    precharge.push(stated.value)
    try {
      usable.push(usableVolume({ ...input, precharge: stated }).usableVolume.value)
    }
    catch (error) {
      if (!(error instanceof EngineInputError)) throw error
      usable.push(0)
    }
  }
  const optimum = optimumPrecharge({ ...input, prechargeUnit: like })
  return {
    precharge,
    usable,
    optimum: { precharge: optimum.precharge, usableVolume: optimum.usableVolume },
    inputs: input,
    method: `usable volume at each pre-charge; ${optimum.method}`,
    engineVersion: ENGINE_VERSION,
  }
}
