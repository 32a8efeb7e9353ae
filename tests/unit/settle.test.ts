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

  it('names a reading of another basis by its place in the request, not after sorting', () => {
    expect(() => forecastSettledPressure({
      readings: [
        { minutesAfter: 9, pressure: psig(1000) },
        { minutesAfter: 1, pressure: { value: 1015, unit: 'psi', basis: 'absolute' } },
        { minutesAfter: 5, pressure: psig(1005) },
      ],
    })).toThrow(expect.objectContaining({ field: 'readings.1.pressure.basis' }))
  })
})

describe('an honest forecast uncertainty', () => {
  const series = (points: number[][]) =>
    points.map(([minutesAfter, value]) => ({ minutesAfter: minutesAfter!, pressure: psig(value!) }))
  const onCurve = (minutes: number) => 1000 + 80 * Math.exp(-minutes / 4)

  it('readings exactly on the curve never widen the interval as they are added, whatever τ was expected', () => {
    // Invented series: p∞ = 1000 psig, Δ = 80 psi, τ = 4 min, a reading every 2 min from 1 min.
    for (const expected of [2, 4, 8]) {
      let previous = Number.POSITIVE_INFINITY
      for (let count = 2; count <= 10; count++) {
        const readings = Array.from({ length: count }, (_, index) =>
          ({ minutesAfter: 1 + 2 * index, pressure: psig(onCurve(1 + 2 * index)) }))
        const forecast = forecastSettledPressure({ readings, timeConstantMinutes: expected, readingUncertainty: 2 })
        expect(forecast.uncertainty).toBeLessThanOrEqual(previous)
        expect(Math.abs(forecast.settled.value - 1000)).toBeLessThanOrEqual(forecast.uncertainty)
        previous = forecast.uncertainty
      }
    }
  })

  it('a third reading on the curve tightens the two-reading forecast (1060, 1010, 985 psig at 0.9, 2.9, 4.9 min)', () => {
    // By hand (Aitken): the steps −50 and −25 halve every 2 min, so τ = 2/ln 2 = 2.885 min and
    // p∞ = (1060·985 − 1010²)/(1060 + 985 − 2·1010) = 24000/25 = 960 psig. ∂p∞/∂p = (1, −4, 4), so with a
    // reading σ of 2 psi the 2σ interval is 2·2·√33 = 22.98 psi.
    const readings = series([[0.9, 1060], [2.9, 1010], [4.9, 985]])
    const two = forecastSettledPressure({
      readings: readings.slice(0, 2), timeConstantMinutes: 4, readingUncertainty: 2,
    })
    const three = forecastSettledPressure({ readings, timeConstantMinutes: 4, readingUncertainty: 2 })
    expect(three.uncertainty).toBeLessThan(two.uncertainty)
    const alone = forecastSettledPressure({ readings, readingUncertainty: 2 })
    expect(alone.settled.value).toBeCloseTo(960, 6)
    expect(alone.timeConstantMinutes).toBeCloseTo(2 / Math.LN2, 4)
    expect(alone.uncertainty).toBeCloseTo(2 * 2 * Math.sqrt(33), 2)
  })

  it('rounded readings with no stated accuracy are never ±0: a default gauge sets σ; the verdict is too close to tell', () => {
    // Truth 1000 psig, τ = 4 min, rounded to 1 psi: 1078, 1047, 1029 psig at 1, 3, 5 min. The band 1001–1100 psig
    // excludes the truth; three readings leave no residual to estimate the scatter from.
    const readings = series([[1, 1078], [3, 1047], [5, 1029]])
    const forecast = forecastSettledPressure({ readings, band: { low: psig(1001), high: psig(1100) } })
    expect(forecast.readingSigma.source).toBe('default')
    expect(forecast.readingSigma.value).toBeCloseTo(10.78, 2)
    expect(forecast.uncertainty).toBeGreaterThan(10)
    expect(forecast.verdict).toBe('undecided')
    expect(forecast.warnings.join(' ')).toMatch(/states no accuracy/)
    // A stated accuracy below the resolution: the resolution rules.
    const fine = forecastSettledPressure({ readings, readingUncertainty: 0.1, resolution: 1 })
    expect(fine.readingSigma).toEqual({ value: 1, unit: 'psi', source: 'resolution' })
    expect(fine.method).toMatch(/resolution/)
  })

  it('the 2σ interval holds the true settled value in at least 90 % of 1,000 synthetic noisy series', () => {
    // Invented: p∞ = 1000 psig, Δ = 80 psi, τ = 4 min, readings every 2 min from 1 min with Gaussian scatter of
    // σ = 2 psi (the stated accuracy). A fixed seed keeps the test repeatable.
    let seed = 20261204
    const uniform = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648
      return (seed + 0.5) / 2147483648
    }
    const gaussian = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
    for (const [count, expected] of [[5, undefined], [4, 4], [2, 4]] as const) {
      let held = 0
      for (let series = 0; series < 1000; series++) {
        const readings = Array.from({ length: count }, (_, index) => ({
          minutesAfter: 1 + 2 * index,
          pressure: psig(onCurve(1 + 2 * index) + 2 * gaussian()),
        }))
        const forecast = forecastSettledPressure({ readings, timeConstantMinutes: expected, readingUncertainty: 2 })
        if (Math.abs(forecast.settled.value - 1000) <= forecast.uncertainty) held++
      }
      expect(held, `${count} readings, τ expected ${expected ?? 'none'}`).toBeGreaterThanOrEqual(900)
    }
  })
})
