/**
 * The settled-pressure forecast (shared/gas/settle.ts): Newton's law of cooling with the gas law,
 * p(t) = p∞ + (p₀ − p∞)·e^(−t/τ), checked against a worked example by hand and a synthetic series
 * of known time constant.
 */
import { describe, expect, it } from 'vitest'
import { forecastSettledPressure, timeConstantFromSettleTime } from '../../shared/gas/settle'

const psig = (value: number) => ({ value, unit: 'psi' as const, basis: 'gauge' as const })

describe('the settled reading after a charge', () => {
  it('three equally spaced readings, by hand: 1100, 1060, 1040 psig at 0, 10, 20 min settle at 1020 psig, τ = 10/ln 2', () => {
    // By hand (Aitken's Δ² for a geometric approach): the steps −40 and −20 halve each 10 min, so e^(−10/τ) = 1/2,
    // τ = 10/ln 2 = 14.43 min, and p∞ = (p₁p₃ − p₂²)/(p₁ + p₃ − 2p₂) = (1100·1040 − 1060²)/(1100 + 1040 − 2120) = 1020.
    const forecast = forecastSettledPressure({
      readings: [
        { minutesAfter: 0, pressure: psig(1100) },
        { minutesAfter: 10, pressure: psig(1060) },
        { minutesAfter: 20, pressure: psig(1040) },
      ],
      readingUncertainty: 2,
      band: { low: psig(975), high: psig(1075) },
    })
    expect(forecast.settled.value).toBeCloseTo(1020, 3)
    expect(forecast.timeConstantMinutes).toBeCloseTo(10 / Math.LN2, 3)
    expect(forecast.fitted).toBe('three-point')
    expect(forecast.verdict).toBe('in-limits')
    expect(forecast.uncertainty).toBeGreaterThan(0)
    expect(forecast.method).toMatch(/Newton's law of cooling[\s\S]*Advice only/)
  })

  it('a synthetic series of known time constant (τ = 8 min, settling at 985 psig after a vent) is recovered within its uncertainty', () => {
    // Synthetic (invented for the test): the gas warms after a vent, from 940 toward 985 psig; ±1 psi of
    // reading scatter.
    const scatter = [0.8, -0.6, 0.3, -0.9, 0.5, -0.2, 0.7, -0.4, 0.1, -0.7]
    const readings = scatter.map((noise, index) => {
      const minutes = 1 + index * 2
      return { minutesAfter: minutes, pressure: psig(985 - 45 * Math.exp(-minutes / 8) + noise) }
    })
    const forecast = forecastSettledPressure({ readings, readingUncertainty: 1 })
    expect(forecast.fitted).toBe('least-squares')
    expect(Math.abs(forecast.settled.value - 985)).toBeLessThanOrEqual(forecast.uncertainty)
    expect(forecast.uncertainty).toBeLessThan(5)
    expect(forecast.timeConstantMinutes).toBeGreaterThan(6)
    expect(forecast.timeConstantMinutes).toBeLessThan(10)
    // Early on (the first four readings, 7 minutes), the same series forecasts more loosely — and still honestly.
    const early = forecastSettledPressure({ readings: readings.slice(0, 4), readingUncertainty: 1 })
    expect(early.uncertainty).toBeGreaterThan(forecast.uncertainty)
    expect(Math.abs(early.settled.value - 985)).toBeLessThanOrEqual(early.uncertainty)
  })

  it('two readings with the time constant assumed, by hand, and a plain warning', () => {
    // By hand: with τ = 10 min, r = e^(−10/10) = e^(−1), p∞ = (p₂ − r·p₁)/(1 − r) = (1060 − 1100/e)/(1 − 1/e)
    // = 1036.72 psig.
    const forecast = forecastSettledPressure({
      readings: [
        { minutesAfter: 0, pressure: psig(1100) },
        { minutesAfter: 10, pressure: psig(1060) },
      ],
      timeConstantMinutes: 10,
    })
    expect(forecast.settled.value).toBeCloseTo((1060 - 1100 / Math.E) / (1 - 1 / Math.E), 6)
    expect(forecast.settled.value).toBeCloseTo(1036.72, 2)
    expect(forecast.fitted).toBe('assumed-time-constant')
    expect(forecast.warnings.join(' ')).toMatch(/time constant is assumed/)
    // An assumed τ could be half or twice: the uncertainty covers that.
    expect(forecast.uncertainty).toBeGreaterThan(5)
  })

  it('says "undecided" when the uncertainty straddles a limit, and "low" when all of it is below', () => {
    const readings = [
      { minutesAfter: 0, pressure: psig(1100) },
      { minutesAfter: 10, pressure: psig(1060) },
      { minutesAfter: 20, pressure: psig(1040) },
    ]
    expect(
      forecastSettledPressure({ readings, readingUncertainty: 2, band: { low: psig(1019), high: psig(1100) } }).verdict,
    ).toBe('undecided')
    expect(
      forecastSettledPressure({ readings, readingUncertainty: 2, band: { low: psig(1060), high: psig(1100) } }).verdict,
    ).toBe('low')
  })

  it('takes the approved data\'s settle time as four time constants', () => {
    expect(timeConstantFromSettleTime(30)).toBe(7.5)
  })

  it('refuses what cannot be forecast, naming the input', () => {
    expect(() => forecastSettledPressure({ readings: [{ minutesAfter: 0, pressure: psig(1000) }] })).toThrow(
      /Two readings/,
    )
    expect(() =>
      forecastSettledPressure({
        readings: [
          { minutesAfter: 3, pressure: psig(1000) },
          { minutesAfter: 3, pressure: psig(990) },
        ],
        timeConstantMinutes: 5,
      }),
    ).toThrow(/same minute/)
    expect(() =>
      forecastSettledPressure({
        readings: [
          { minutesAfter: 0, pressure: psig(1000) },
          { minutesAfter: 5, pressure: psig(990) },
        ],
      }),
    ).toThrow(/time constant/)
    expect(() =>
      forecastSettledPressure({
        readings: [
          { minutesAfter: 0, pressure: psig(1000) },
          { minutesAfter: 5, pressure: { value: 1000, unit: 'psi', basis: 'absolute' } },
        ],
        timeConstantMinutes: 5,
      }),
    ).toThrow(/same basis/)
  })
})
