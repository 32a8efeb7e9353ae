import { EngineInputError } from './errors'
import {
  assertRealGasInput, NITROGEN_GAS_CONSTANT, nitrogenDensity, nitrogenIsentropicToDensity,
  nitrogenIsentropicToPressure, nitrogenPressure, nitrogenTemperature,
} from './nitrogen'
import type { GasModel, Process } from './types'

/** A state of a fixed mass of gas, SI: Pa absolute, K, kg/m³. */
export interface GasState { pressure: number, temperature: number, density: number }

/** The ratio of specific heats the ideal model uses for "adiabatic" (diatomic gas). */
export const IDEAL_ADIABATIC_EXPONENT = 1.4

/** The equation of state behind a model, SI throughout. */
export interface GasLaw {
  model: GasModel
  density(pressure: number, temperature: number): number
  pressure(density: number, temperature: number): number
  temperature(density: number, pressure: number): number
  isentropicToPressure(from: GasState, pressure: number): GasState
  isentropicToDensity(from: GasState, density: number): GasState
  /** Rejects an input state outside the model's range, naming the field. */
  checkInput(temperature: number, pressure: number, field: string): void
}

const idealGas: GasLaw = {
  model: 'ideal',
  density: (pressure, temperature) => pressure / (NITROGEN_GAS_CONSTANT * temperature),
  pressure: (density, temperature) => density * NITROGEN_GAS_CONSTANT * temperature,
  temperature: (density, pressure) => pressure / (density * NITROGEN_GAS_CONSTANT),
  isentropicToPressure(from, pressure) {
    const density = from.density * Math.pow(pressure / from.pressure, 1 / IDEAL_ADIABATIC_EXPONENT)
    return { pressure, density, temperature: pressure / (density * NITROGEN_GAS_CONSTANT) }
  },
  isentropicToDensity(from, density) {
    const pressure = from.pressure * Math.pow(density / from.density, IDEAL_ADIABATIC_EXPONENT)
    return { pressure, density, temperature: pressure / (density * NITROGEN_GAS_CONSTANT) }
  },
  checkInput(temperature, pressure, field) {
    if (!(temperature > 0)) throw new EngineInputError('Temperature must be above absolute zero.', field)
    if (!(pressure > 0)) throw new EngineInputError('Pressure must be above zero absolute.', field)
  },
}

const realGas: GasLaw = {
  model: 'real',
  density: (pressure, temperature) => nitrogenDensity(pressure, temperature),
  pressure: (density, temperature) => nitrogenPressure(density, temperature),
  temperature: (density, pressure) => nitrogenTemperature(density, pressure),
  isentropicToPressure(from, pressure) {
    const end = nitrogenIsentropicToPressure(from.density, from.temperature, pressure)
    return { pressure, ...end }
  },
  isentropicToDensity(from, density) {
    const end = nitrogenIsentropicToDensity(from.density, from.temperature, density)
    return { density, ...end }
  },
  checkInput: assertRealGasInput,
}

export function gasLaw(model: GasModel = 'real'): GasLaw {
  return model === 'ideal' ? idealGas : realGas
}

export function stateAt(law: GasLaw, pressure: number, temperature: number): GasState {
  return { pressure, temperature, density: law.density(pressure, temperature) }
}

/** The state at constant density (constant gas mass and volume) at another temperature. */
export function stateAtTemperature(law: GasLaw, from: GasState, temperature: number): GasState {
  return { density: from.density, temperature, pressure: law.pressure(from.density, temperature) }
}

function polytropicExponent(process: Process): number | undefined {
  if (typeof process === 'object') {
    if (!(process.n >= 1 && process.n <= 2)) throw new EngineInputError('A polytropic exponent must lie between 1 (isothermal) and 2.', 'n')
    return process.n
  }
  return undefined
}

/**
 * Compresses or expands a fixed gas mass from a state to a pressure:
 * isothermal by the equation of state at constant temperature (Boyle's law for the ideal
 * model), adiabatic as isentropic (p·V^1.4 = const for the ideal model), `{ n }` always by
 * the polytropic law p·Vⁿ = const.
 */
export function changeToPressure(law: GasLaw, process: Process, from: GasState, pressure: number): GasState {
  const exponent = polytropicExponent(process)
  if (exponent !== undefined) {
    const density = from.density * Math.pow(pressure / from.pressure, 1 / exponent)
    return { pressure, density, temperature: law.temperature(density, pressure) }
  }
  if (process === 'isothermal') return stateAt(law, pressure, from.temperature)
  return law.isentropicToPressure(from, pressure)
}

/** The same change, to a density (a gas volume) instead of a pressure. */
export function changeToDensity(law: GasLaw, process: Process, from: GasState, density: number): GasState {
  const exponent = polytropicExponent(process)
  if (exponent !== undefined) {
    const pressure = from.pressure * Math.pow(density / from.density, exponent)
    return { pressure, density, temperature: law.temperature(density, pressure) }
  }
  if (process === 'isothermal') return { density, temperature: from.temperature, pressure: law.pressure(density, from.temperature) }
  return law.isentropicToDensity(from, density)
}

export function describeProcess(process: Process, model: GasModel): string {
  if (typeof process === 'object') return `polytropic p·Vⁿ = const with n = ${process.n}`
  if (process === 'isothermal') return model === 'real' ? 'isothermal (equation of state at constant temperature)' : 'isothermal (Boyle, p·V = const)'
  return model === 'real' ? 'adiabatic (isentropic, equation of state)' : `adiabatic (p·V^${IDEAL_ADIABATIC_EXPONENT} = const)`
}

export function describeModel(model: GasModel): string {
  return model === 'real' ? 'real gas, nitrogen by Span et al. 2000' : 'ideal gas, p·V = m·R·T'
}
