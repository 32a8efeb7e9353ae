import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import {
  lastDensityIterations,
  nitrogenCompressibility,
  nitrogenDensity,
  nitrogenEntropy,
  nitrogenHeatCapacities,
  nitrogenIsentropicToPressure,
  nitrogenPressure,
  NITROGEN_GAS_CONSTANT,
} from '../../shared/gas/nitrogen'

/**
 * Check values for nitrogen, read from tests/fixtures/nitrogen-span2000.json (the team's reference
 * file, kept unchanged in the repository). Source: Span, Lemmon, Jacobsen, Wagner and Yokozeki,
 * J. Phys. Chem. Ref. Data 29(6), 1361–1433 (2000), as computed with CoolProp 8.0.0 (which implements
 * that equation). Entropy is compared as differences between points (reference states differ between tools).
 */
interface CheckPoint {
  T_K: number
  p_MPa: number
  density_kg_per_m3: number
  Z: number
  s_J_per_kgK: number
  cp_over_cv: number
}
const reference = JSON.parse(readFileSync(new URL('../fixtures/nitrogen-span2000.json', import.meta.url), 'utf8')) as {
  checkValues: { points: CheckPoint[] }
}
const CHECK_POINTS = reference.checkValues.points.map(point => ({
  T: point.T_K,
  pMPa: point.p_MPa,
  density: point.density_kg_per_m3,
  Z: point.Z,
  s: point.s_J_per_kgK,
  gamma: point.cp_over_cv,
}))

describe('nitrogen by Span et al. (2000)', () => {
  it.each(CHECK_POINTS)('density, Z and cp/cv at $T K, $pMPa MPa', ({ T, pMPa, density, Z, gamma }) => {
    const rho = nitrogenDensity(pMPa * 1e6, T)
    expect(rho / density - 1).toBeCloseTo(0, 5) // within 5·10⁻⁶ relative (the check value's printed digits)
    expect(nitrogenCompressibility(rho, T)).toBeCloseTo(Z, 5)
    expect(nitrogenHeatCapacities(rho, T).ratio / gamma - 1).toBeCloseTo(0, 4)
  })

  it.each(CHECK_POINTS)('pressure from the check density at $T K, $pMPa MPa', ({ T, pMPa, density }) => {
    expect(nitrogenPressure(density, T) / (pMPa * 1e6) - 1).toBeCloseTo(0, 5)
  })

  it('entropy differences between check points', () => {
    const base = CHECK_POINTS[4]!
    const baseEntropy = nitrogenEntropy(nitrogenDensity(base.pMPa * 1e6, base.T), base.T)
    for (const point of CHECK_POINTS) {
      const entropy = nitrogenEntropy(nitrogenDensity(point.pMPa * 1e6, point.T), point.T)
      expect(entropy - baseEntropy).toBeCloseTo(point.s - base.s, 1)
    }
  })

  it('an isentropic change keeps the entropy and lands on the check state', () => {
    // From 300 K, 30 MPa, expand isentropically to 10 MPa; entropy must equal the start's.
    const startDensity = nitrogenDensity(30e6, 300)
    const end = nitrogenIsentropicToPressure(startDensity, 300, 10e6)
    expect(nitrogenEntropy(end.density, end.temperature)).toBeCloseTo(nitrogenEntropy(startDensity, 300), 5)
    expect(nitrogenPressure(end.density, end.temperature) / 10e6).toBeCloseTo(1, 9)
    expect(end.temperature).toBeLessThan(300)
  })

  it('tends to the ideal gas at low pressure', () => {
    // Z → 1 as p → 0; at 0.1 MPa and 300 K, Z = 0.9998 for nitrogen (NIST Chemistry WebBook; from memory).
    const rho = nitrogenDensity(1e5, 300)
    expect(nitrogenCompressibility(rho, 300)).toBeCloseTo(0.9998, 4)
    // Specific gas constant of nitrogen 296.80 J/(kg·K) = 8.31451 / 0.02801348 (CODATA-era R used by the equation).
    expect(NITROGEN_GAS_CONSTANT).toBeCloseTo(296.8, 2)
  })

  it('the density solve converges in a few Newton steps for every state in range', () => {
    let worst = 0
    for (let pressure = 5e4; pressure <= 50e6; pressure *= 1.1) {
      for (let temperature = 203.15; temperature <= 393.15; temperature += 5) {
        const density = nitrogenDensity(pressure, temperature, false)
        // Newton converges quadratically: stopping once a step is below 1e-8 of the density
        // leaves an error near 1e-16, so the round trip holds to within a few ulps.
        expect(Math.abs(nitrogenPressure(density, temperature) / pressure - 1)).toBeLessThan(1e-14)
        worst = Math.max(worst, lastDensityIterations())
      }
    }
    expect(worst).toBeLessThanOrEqual(8)
  })

  it('refuses states outside the accepted range with a clear error', () => {
    expect(() => nitrogenDensity(1e6, 100)).toThrow(/outside the range/)
    expect(() => nitrogenDensity(60e6, 300, false)).toThrow(/above the real-gas range/)
  })
})
