/**
 * Nitrogen by its reference equation of state:
 * R. Span, E. W. Lemmon, R. T. Jacobsen, W. Wagner, A. Yokozeki, "A Reference Equation of State
 * for the Thermodynamic Properties of Nitrogen for Temperatures from 63.151 to 1000 K and
 * Pressures to 2200 MPa", J. Phys. Chem. Ref. Data 29(6), 1361–1433 (2000).
 *
 * Reduced Helmholtz energy a/(RT) = α⁰(δ,τ) + αʳ(δ,τ), δ = ρ/ρr, τ = Tr/T. Coefficients as
 * distributed in the CoolProp nitrogen fluid file (MIT licence), copied here as data.
 * All quantities SI: Pa, K, kg/m³, J/(kg·K).
 */
import { EngineInputError } from './errors'

const MOLAR_GAS_CONSTANT = 8.31451 // J/(mol·K), as used by the equation
const MOLAR_MASS = 0.02801348 // kg/mol
/** Specific gas constant of nitrogen, J/(kg·K). */
export const NITROGEN_GAS_CONSTANT = MOLAR_GAS_CONSTANT / MOLAR_MASS
const REDUCING_TEMPERATURE = 126.192 // K (critical temperature)
const REDUCING_DENSITY = 11183.901464580624 * MOLAR_MASS // kg/m³

/** Range in which Chargewell accepts input states: −70 °C to +120 °C, up to 50 MPa. */
export const REAL_GAS_INPUT_RANGE = { minKelvin: 203.15, maxKelvin: 393.15, maxPascal: 50e6 } as const
/**
 * Range for states the engine reaches internally (an adiabatic expansion cools the gas below
 * −70 °C): kept above the critical temperature so the fluid is single-phase, below the
 * equation's upper limit of 1000 K.
 */
const INTERNAL_RANGE = { minKelvin: 130, maxKelvin: 1000, maxPascal: 100e6 } as const

// Ideal-gas part α⁰
const LEAD_A1 = -12.76952708
const LEAD_A2 = -0.00784163
const LOG_TAU = 2.5
const IDEAL_POWER_N = [-0.0001934819, -1.247742e-5, 6.678326e-8]
const IDEAL_POWER_T = [-1, -2, -3]
const PLANCK_N = 1.012941
const PLANCK_THETA = 3364.011 / REDUCING_TEMPERATURE // v/Tcrit, multiplies τ

// Residual part αʳ: power terms n·δ^d·τ^t·exp(−δ^l) (no exponential where l = 0)
const POWER_N = [
  0.924803575275, -0.492448489428, 0.661883336938, -1.92902649201, -0.0622469309629, 0.349943957581, 0.564857472498,
  -1.61720005987, -0.481395031883, 0.421150636384, -0.0161962230825, 0.172100994165, 0.00735448924933, 0.0168077305479,
  -0.00107626664179, -0.0137318088513, 0.000635466899859, 0.00304432279419, -0.0435762336045, -0.0723174889316,
  0.0389644315272, -0.021220136391, 0.00408822981509, -5.51990017984e-5, -0.0462016716479, -0.00300311716011,
  0.0368825891208, -0.0025585684622, 0.00896915264558, -0.0044151337035, 0.00133722924858, 0.000264832491957,
]
const POWER_D = [1, 1, 2, 2, 3, 3, 1, 1, 1, 3, 3, 4, 6, 6, 7, 7, 8, 8, 1, 2, 3, 4, 5, 8, 4, 5, 5, 8, 3, 5, 6, 9]
const POWER_T = [
  0.25, 0.875, 0.5, 0.875, 0.375, 0.75, 0.5, 0.75, 2, 1.25, 3.5, 1, 0.5, 3, 0, 2.75, 0.75, 2.5, 4, 6, 6, 3, 3, 6, 16,
  11, 15, 12, 12, 7, 4, 16,
]
const POWER_L = [0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2, 3, 3, 3, 3, 4, 4, 4, 4]

// Residual part αʳ: Gaussian terms n·δ^d·τ^t·exp(−η(δ−ε)² − β(τ−γ)²)
const GAUSS_N = [19.6688194015, -20.911560073, 0.0167788306989, 2627.67566274]
const GAUSS_D = [1, 1, 3, 2]
const GAUSS_T = [0, 1, 2, 3]
const GAUSS_ETA = [20, 20, 15, 25]
const GAUSS_BETA = [325, 325, 300, 275]
const GAUSS_GAMMA = [1.16, 1.16, 1.13, 1.25]
const GAUSS_EPSILON = [1, 1, 1, 1]

const POWER_COUNT = POWER_N.length
const GAUSS_COUNT = GAUSS_N.length

// τ-dependent factors. Every exponent t is a multiple of 1/8, so τ^t is a whole power of τ times one
// of τ^(k/8), k < 8, both built by repeated multiplication (one root instead of 36 powers). Two slots
// are kept: a charge target alternates between the reference and the gas temperature.
const POWER_T_EIGHTHS = POWER_T.map(exponent => Math.round(exponent * 8))
const GAUSS_T_EIGHTHS = GAUSS_T.map(exponent => Math.round(exponent * 8))
const MAX_EIGHTHS = Math.max(...POWER_T_EIGHTHS, ...GAUSS_T_EIGHTHS)
const tauFractions = new Float64Array(8)
const tauWholes = new Float64Array((MAX_EIGHTHS >> 3) + 1)

// The power terms share 22 pairs of δ exponents (d, l) among 32 terms: a density solve, which holds τ
// fixed, sums each pair's τ factors once per temperature and then evaluates 22 terms per step.
const PAIR_KEYS = [...new Set(POWER_D.map((d, i) => `${d},${POWER_L[i]}`))]
const PAIR_COUNT = PAIR_KEYS.length
const PAIR_D = Int32Array.from(PAIR_KEYS, key => Number(key.split(',')[0]))
const PAIR_L = Int32Array.from(PAIR_KEYS, key => Number(key.split(',')[1]))
const PAIR_OF = Int32Array.from(POWER_D, (d, i) => PAIR_KEYS.indexOf(`${d},${POWER_L[i]}`))
const MAX_D = Math.max(...POWER_D, ...GAUSS_D)
// A Gaussian term with the previous one's ε and η has its δ exponential too (the first two).
const GAUSS_SHARES_PREVIOUS = GAUSS_ETA.map((eta, i) =>
  i > 0 && eta === GAUSS_ETA[i - 1] && GAUSS_EPSILON[i] === GAUSS_EPSILON[i - 1])

interface TauSlot {
  tau: number
  /** n·τ^t of each power term */
  power: Float64Array
  /** Σ n·τ^t of the power terms of each (d, l) pair */
  pair: Float64Array
  /** n·τ^t·exp(−β(τ−γ)²) of each Gaussian term */
  gauss: Float64Array
  /** t/τ − 2β(τ−γ) of each Gaussian term */
  gaussSlope: Float64Array
}

const newSlot = (): TauSlot => ({
  tau: Number.NaN,
  power: new Float64Array(POWER_COUNT),
  pair: new Float64Array(PAIR_COUNT),
  gauss: new Float64Array(GAUSS_COUNT),
  gaussSlope: new Float64Array(GAUSS_COUNT),
})
const tauSlots = [newSlot(), newSlot()]
let lastSlot = 0

function prepareTau(tau: number): TauSlot {
  if (tauSlots[lastSlot]!.tau === tau) return tauSlots[lastSlot]!
  const other = 1 - lastSlot
  if (tauSlots[other]!.tau === tau) {
    lastSlot = other
    return tauSlots[other]!
  }
  const slot = tauSlots[other]!
  // τ^(k/8) = τ^⌊k/8⌋ · τ^((k mod 8)/8): two short chains of products instead of one of 128.
  const eighth = Math.sqrt(Math.sqrt(Math.sqrt(tau)))
  tauFractions[0] = 1
  for (let k = 1; k < 8; k++) tauFractions[k] = tauFractions[k - 1]! * eighth
  tauWholes[0] = 1
  for (let k = 1; k < tauWholes.length; k++) tauWholes[k] = tauWholes[k - 1]! * tau
  for (let i = 0; i < POWER_COUNT; i++) {
    const eighths = POWER_T_EIGHTHS[i]!
    slot.power[i] = POWER_N[i]! * tauWholes[eighths >> 3]! * tauFractions[eighths & 7]!
  }
  slot.pair.fill(0)
  for (let i = 0; i < POWER_COUNT; i++) slot.pair[PAIR_OF[i]!]! += slot.power[i]!
  for (let i = 0; i < GAUSS_COUNT; i++) {
    const offset = tau - GAUSS_GAMMA[i]!
    const eighths = GAUSS_T_EIGHTHS[i]!
    const tauT = tauWholes[eighths >> 3]! * tauFractions[eighths & 7]!
    slot.gauss[i] = GAUSS_N[i]! * tauT * Math.exp(-GAUSS_BETA[i]! * offset * offset)
    slot.gaussSlope[i] = GAUSS_T[i]! / tau - 2 * GAUSS_BETA[i]! * offset
  }
  slot.tau = tau
  lastSlot = other
  return slot
}

/** αʳ and its partial derivatives at one (δ, τ). */
export interface ResidualHelmholtz {
  value: number
  d: number
  dd: number
  t: number
  tt: number
  dt: number
}

const deltaPower = new Float64Array(5)
const expMinusDeltaPower = new Float64Array(5)

/** Residual Helmholtz energy αʳ(δ, τ) with first and second derivatives. */
function prepareDelta(delta: number): void {
  deltaPower[0] = 0 // l = 0: no exponential factor, and no l·δ^l term
  expMinusDeltaPower[0] = 1
  let power = 1
  for (let l = 1; l <= 4; l++) {
    power *= delta
    deltaPower[l] = power
    expMinusDeltaPower[l] = Math.exp(-power)
  }
}

export function residualHelmholtz(
  delta: number,
  tau: number,
  out: ResidualHelmholtz = { value: 0, d: 0, dd: 0, t: 0, tt: 0, dt: 0 },
): ResidualHelmholtz {
  const slot = prepareTau(tau)
  prepareDelta(delta)
  const inverseDelta = 1 / delta
  const inverseTau = 1 / tau
  let value = 0
  let d = 0
  let dd = 0
  let t = 0
  let tt = 0
  let dt = 0
  for (let i = 0; i < POWER_COUNT; i++) {
    const exponentD = POWER_D[i]!
    const exponentL = POWER_L[i]!
    const exponentT = POWER_T[i]!
    const deltaL = deltaPower[exponentL]!
    let deltaD = delta
    for (let k = 1; k < exponentD; k++) deltaD *= delta
    const term = slot.power[i]! * deltaD * expMinusDeltaPower[exponentL]!
    const slope = exponentD - exponentL * deltaL // δ·∂ln(term)/∂δ
    value += term
    d += term * slope * inverseDelta
    dd += term * (slope * (slope - 1) - exponentL * exponentL * deltaL) * inverseDelta * inverseDelta
    t += term * exponentT * inverseTau
    tt += term * exponentT * (exponentT - 1) * inverseTau * inverseTau
    dt += term * exponentT * inverseTau * slope * inverseDelta
  }
  for (let i = 0; i < GAUSS_COUNT; i++) {
    const exponentD = GAUSS_D[i]!
    const offset = delta - GAUSS_EPSILON[i]!
    const eta = GAUSS_ETA[i]!
    let deltaD = delta
    for (let k = 1; k < exponentD; k++) deltaD *= delta
    const term = slot.gauss[i]! * deltaD * Math.exp(-eta * offset * offset)
    const slopeDelta = exponentD * inverseDelta - 2 * eta * offset
    const slopeTau = slot.gaussSlope[i]!
    value += term
    d += term * slopeDelta
    dd += term * (slopeDelta * slopeDelta - exponentD * inverseDelta * inverseDelta - 2 * eta)
    t += term * slopeTau
    tt += term * (slopeTau * slopeTau - GAUSS_T[i]! * inverseTau * inverseTau - 2 * GAUSS_BETA[i]!)
    dt += term * slopeDelta * slopeTau
  }
  return Object.assign(out, { value, d, dd, t, tt, dt })
}

/** Ideal-gas Helmholtz energy α⁰(δ, τ) and its τ derivatives. */
export function idealHelmholtz(delta: number, tau: number): { value: number, t: number, tt: number } {
  let value = Math.log(delta) + LEAD_A1 + LEAD_A2 * tau + LOG_TAU * Math.log(tau)
  let t = LEAD_A2 + LOG_TAU / tau
  let tt = -LOG_TAU / (tau * tau)
  for (let i = 0; i < IDEAL_POWER_N.length; i++) {
    const n = IDEAL_POWER_N[i]!
    const exponent = IDEAL_POWER_T[i]!
    value += n * Math.pow(tau, exponent)
    t += n * exponent * Math.pow(tau, exponent - 1)
    tt += n * exponent * (exponent - 1) * Math.pow(tau, exponent - 2)
  }
  const e = Math.exp(PLANCK_THETA * tau)
  value += PLANCK_N * Math.log(1 - 1 / e)
  t += (PLANCK_N * PLANCK_THETA) / (e - 1)
  tt -= (PLANCK_N * PLANCK_THETA * PLANCK_THETA * e) / ((e - 1) * (e - 1))
  return { value, t, tt }
}

/** δ^k for k = 0…MAX_D at the δ of the last evaluation. */
const deltaPowers = new Float64Array(MAX_D + 1)

/** ∂αʳ/∂δ and ∂²αʳ/∂δ² only: all a density solve needs (the power terms by their (d, l) pairs). */
const deltaDerivatives = { d: 0, dd: 0 }
function residualDeltaDerivatives(delta: number, tau: number): typeof deltaDerivatives {
  const slot = prepareTau(tau)
  prepareDelta(delta)
  deltaPowers[0] = 1
  for (let k = 1; k <= MAX_D; k++) deltaPowers[k] = deltaPowers[k - 1]! * delta
  const inverseDelta = 1 / delta
  let d = 0
  let dd = 0
  for (let g = 0; g < PAIR_COUNT; g++) {
    const exponentD = PAIR_D[g]!
    const exponentL = PAIR_L[g]!
    const deltaL = deltaPower[exponentL]!
    const term = slot.pair[g]! * deltaPowers[exponentD]! * expMinusDeltaPower[exponentL]!
    const slope = exponentD - exponentL * deltaL
    d += term * slope
    dd += term * (slope * (slope - 1) - exponentL * exponentL * deltaL)
  }
  d *= inverseDelta
  dd *= inverseDelta * inverseDelta
  let factor = 0
  for (let i = 0; i < GAUSS_COUNT; i++) {
    const exponentD = GAUSS_D[i]!
    const offset = delta - GAUSS_EPSILON[i]!
    const eta = GAUSS_ETA[i]!
    if (!GAUSS_SHARES_PREVIOUS[i]) factor = Math.exp(-eta * offset * offset)
    const term = slot.gauss[i]! * deltaPowers[exponentD]! * factor
    const slopeDelta = exponentD * inverseDelta - 2 * eta * offset
    d += term * slopeDelta
    dd += term * (slopeDelta * slopeDelta - exponentD * inverseDelta * inverseDelta - 2 * eta)
  }
  deltaDerivatives.d = d
  deltaDerivatives.dd = dd
  return deltaDerivatives
}

const scratch: ResidualHelmholtz = { value: 0, d: 0, dd: 0, t: 0, tt: 0, dt: 0 }

function checkState(temperature: number, pressureOrDensity: number, internal: boolean): void {
  const range = internal ? INTERNAL_RANGE : REAL_GAS_INPUT_RANGE
  if (!(temperature >= range.minKelvin - 1e-9 && temperature <= range.maxKelvin + 1e-9)) {
    const celsius = (temperature - 273.15).toFixed(1)
    throw new EngineInputError(
      internal
        ? `The gas would reach ${celsius} °C, outside the range of the nitrogen equation of state used here (${(range.minKelvin - 273.15).toFixed(0)} °C to ${(range.maxKelvin - 273.15).toFixed(0)} °C).`
        : `Gas temperature ${celsius} °C is outside the real-gas range (−70 °C to +120 °C).`,
    )
  }
  if (!(pressureOrDensity > 0) || !Number.isFinite(pressureOrDensity)) {
    throw new EngineInputError('Gas pressure must be above zero absolute.')
  }
}

/** Pressure (Pa) from density (kg/m³) and temperature (K): p = ρRT(1 + δ·∂αʳ/∂δ). */
export function nitrogenPressure(density: number, temperature: number): number {
  checkState(temperature, density, true)
  const delta = density / REDUCING_DENSITY
  const residual = residualDeltaDerivatives(delta, REDUCING_TEMPERATURE / temperature)
  return density * NITROGEN_GAS_CONSTANT * temperature * (1 + delta * residual.d)
}

/**
 * Density (kg/m³) from pressure (Pa) and temperature (K). Newton's method on p(ρ) from the
 * ideal-gas density, kept inside a bracket that tightens each step and falls back to
 * bisection, so it converges for every supercritical state (all of Chargewell's range).
 */
/** Newton steps the last density solve took (read by the tests of the solver). */
const solverStatistics = { densityIterations: 0 }
export function lastDensityIterations(): number {
  return solverStatistics.densityIterations
}

export function nitrogenDensity(pressure: number, temperature: number, internal = true): number {
  checkState(temperature, pressure, internal)
  if (pressure > (internal ? INTERNAL_RANGE.maxPascal : REAL_GAS_INPUT_RANGE.maxPascal) * (1 + 1e-12)) {
    throw new EngineInputError(
      `Gas pressure ${(pressure / 1e6).toFixed(2)} MPa absolute is above the real-gas range (50 MPa).`,
    )
  }
  const tau = REDUCING_TEMPERATURE / temperature
  const rt = NITROGEN_GAS_CONSTANT * temperature
  let low = 0
  let high = 1500 // kg/m³, denser than any state in range
  let density = pressure / rt
  for (let iteration = 0; iteration < 100; iteration++) {
    const delta = density / REDUCING_DENSITY
    const residual = residualDeltaDerivatives(delta, tau)
    const error = density * rt * (1 + delta * residual.d) - pressure
    if (error > 0) high = density
    else low = density
    const slope = rt * (1 + 2 * delta * residual.d + delta * delta * residual.dd)
    const step = error / slope
    if (slope > 0 && Math.abs(step) <= 1e-8 * density) {
      solverStatistics.densityIterations = iteration + 1
      return density - step
    }
    let next = density - step
    // A step out of the bracket (or a non-monotone slope) falls back to bisection.
    if (!(slope > 0) || !(next > low && next < high)) next = 0.5 * (low + high)
    density = next
  }
  throw new EngineInputError(
    `The nitrogen density did not converge at ${(pressure / 1e6).toFixed(3)} MPa and ${(temperature - 273.15).toFixed(1)} °C.`,
  )
}

/** Specific entropy s = R[τ(α⁰τ + αʳτ) − α⁰ − αʳ], J/(kg·K), with CoolProp's reference state. */
export function nitrogenEntropy(density: number, temperature: number): number {
  const delta = density / REDUCING_DENSITY
  const tau = REDUCING_TEMPERATURE / temperature
  const ideal = idealHelmholtz(delta, tau)
  const residual = residualHelmholtz(delta, tau, scratch)
  return NITROGEN_GAS_CONSTANT * (tau * (ideal.t + residual.t) - ideal.value - residual.value)
}

/** Isochoric and isobaric heat capacities, J/(kg·K), and their ratio. */
export function nitrogenHeatCapacities(
  density: number,
  temperature: number,
): { cv: number, cp: number, ratio: number } {
  const { cv, cp } = entropyAndHeatCapacities(density, temperature)
  return { cv, cp, ratio: cp / cv }
}

/**
 * Entropy and heat capacities from one evaluation of the Helmholtz energy: what each Newton
 * step of an isentropic change needs.
 */
const entropyState = { entropy: 0, cv: 0, cp: 0 }
function entropyAndHeatCapacities(density: number, temperature: number): typeof entropyState {
  const delta = density / REDUCING_DENSITY
  const tau = REDUCING_TEMPERATURE / temperature
  const ideal = idealHelmholtz(delta, tau)
  const r = residualHelmholtz(delta, tau, scratch)
  const cv = -NITROGEN_GAS_CONSTANT * tau * tau * (ideal.tt + r.tt)
  const numerator = 1 + delta * r.d - delta * tau * r.dt
  entropyState.entropy = NITROGEN_GAS_CONSTANT * (tau * (ideal.t + r.t) - ideal.value - r.value)
  entropyState.cv = cv
  entropyState.cp = cv + (NITROGEN_GAS_CONSTANT * numerator * numerator) / (1 + 2 * delta * r.d + delta * delta * r.dd)
  return entropyState
}

/** Compressibility factor Z = p/(ρRT). */
export function nitrogenCompressibility(density: number, temperature: number): number {
  return nitrogenPressure(density, temperature) / (density * NITROGEN_GAS_CONSTANT * temperature)
}

/** Temperature (K) at which nitrogen of a given density has a given pressure (Newton on T, ∂p/∂T at constant ρ). */
export function nitrogenTemperature(
  density: number,
  pressure: number,
  guess = pressure / (density * NITROGEN_GAS_CONSTANT),
): number {
  let temperature = Math.min(Math.max(guess, INTERNAL_RANGE.minKelvin), INTERNAL_RANGE.maxKelvin)
  for (let iteration = 0; iteration < 60; iteration++) {
    const delta = density / REDUCING_DENSITY
    const tau = REDUCING_TEMPERATURE / temperature
    const r = residualHelmholtz(delta, tau, scratch)
    const error = density * NITROGEN_GAS_CONSTANT * temperature * (1 + delta * r.d) - pressure
    const slope = density * NITROGEN_GAS_CONSTANT * (1 + delta * r.d - delta * tau * r.dt)
    const next = temperature - error / slope
    checkState(next, density, true)
    if (Math.abs(next - temperature) < 1e-10 * temperature) return next
    temperature = next
  }
  throw new EngineInputError('The gas temperature for that state did not converge.')
}

/**
 * The isentropic (reversible adiabatic) change from (ρ₁, T₁) to pressure p₂: Newton on T with
 * ∂s/∂T at constant p = cp/T, starting from the ideal-gas estimate.
 */
export function nitrogenIsentropicToPressure(
  density: number,
  temperature: number,
  pressure: number,
): { density: number, temperature: number } {
  const entropy = nitrogenEntropy(density, temperature)
  const startPressure = nitrogenPressure(density, temperature)
  let t = temperature * Math.pow(pressure / startPressure, 0.4 / 1.4)
  t = Math.min(Math.max(t, INTERNAL_RANGE.minKelvin), INTERNAL_RANGE.maxKelvin)
  for (let iteration = 0; iteration < 60; iteration++) {
    const rho = nitrogenDensity(pressure, t)
    const state = entropyAndHeatCapacities(rho, t)
    const next = t - ((state.entropy - entropy) * t) / state.cp
    checkState(next, pressure, true)
    if (Math.abs(next - t) < 1e-10 * t) return { density: nitrogenDensity(pressure, next), temperature: next }
    t = next
  }
  throw new EngineInputError('The adiabatic (isentropic) change did not converge.')
}

/** The isentropic change from (ρ₁, T₁) to density ρ₂: Newton on T with ∂s/∂T at constant ρ = cv/T. */
export function nitrogenIsentropicToDensity(
  density: number,
  temperature: number,
  targetDensity: number,
): { pressure: number, temperature: number } {
  const entropy = nitrogenEntropy(density, temperature)
  let t = temperature * Math.pow(targetDensity / density, 0.4)
  t = Math.min(Math.max(t, INTERNAL_RANGE.minKelvin), INTERNAL_RANGE.maxKelvin)
  for (let iteration = 0; iteration < 60; iteration++) {
    const state = entropyAndHeatCapacities(targetDensity, t)
    const next = t - ((state.entropy - entropy) * t) / state.cv
    checkState(next, targetDensity, true)
    if (Math.abs(next - t) < 1e-10 * t) return { pressure: nitrogenPressure(targetDensity, next), temperature: next }
    t = next
  }
  throw new EngineInputError('The adiabatic (isentropic) change did not converge.')
}

/** Rejects an input state outside −70 °C…+120 °C or above 50 MPa, naming the field. */
export function assertRealGasInput(temperature: number, pressure: number, field: string): void {
  if (!(temperature >= REAL_GAS_INPUT_RANGE.minKelvin - 1e-9 && temperature <= REAL_GAS_INPUT_RANGE.maxKelvin + 1e-9)) {
    throw new EngineInputError(
      `${(temperature - 273.15).toFixed(1)} °C is outside the real-gas range (−70 °C to +120 °C).`,
      field,
    )
  }
  if (!(pressure > 0) || pressure > REAL_GAS_INPUT_RANGE.maxPascal * (1 + 1e-12)) {
    throw new EngineInputError(
      `${(pressure / 1e6).toFixed(2)} MPa absolute is outside the real-gas range (above 0 up to 50 MPa).`,
      field,
    )
  }
}
