import { lusolve, multiply, transpose } from 'mathjs'
import { linearRegression } from 'simple-statistics'
import { describe, expect, it } from 'vitest'
import { leakInterval, leakRate, prechargeTrend } from '../../shared/gas/leakage'
import { assessUnitTrend } from '../../shared/utils/trend-flags'

const psia = (value: number) => ({ value, unit: 'psi' as const, basis: 'absolute' as const })
const room = { value: 20, unit: 'C' as const }
const cycle = {
  gasVolume: { value: 100, unit: 'in3' as const },
  precharge: psia(1000),
  prechargeTemperature: room,
  temperature: room,
  cutOut: psia(3000),
  cutIn: psia(2500),
  model: 'ideal' as const,
}

describe('leak rate from the cut-out → cut-in interval', () => {
  it('by hand from Boyle\'s law: 100 in³ × 1000 × (1/2500 − 1/3000) = 6.667 in³ in 5 min', () => {
    const result = leakRate({ ...cycle, interval: { value: 5, unit: 'min' } })
    expect(result.fluidReleased.value).toBeCloseTo(6.6667, 4)
    expect(result.leakRate).toEqual({ value: expect.closeTo(1.33333, 4), unit: 'in3/min' })
  })

  it('the interval for a leak rate inverts it: the rate leak-rate answers is what leak-interval takes', () => {
    const rate = leakRate({ ...cycle, model: 'real', interval: { value: 300, unit: 's' } })
    const back = leakInterval({ ...cycle, model: 'real', leakRate: rate.leakRate, intervalUnit: 's' })
    expect(back.interval.value).toBeCloseTo(300, 8)
    // The same rate per hour gives the same interval.
    const perHour = leakInterval({ ...cycle, model: 'real', leakRate: { value: rate.leakRate.value * 60, unit: 'in3/h' } })
    expect(perHour.interval.value).toBeCloseTo(5, 8)
  })

  it('refuses cut-in above cut-out and a pre-charge above cut-out', () => {
    expect(() => leakRate({ ...cycle, cutIn: psia(3100), interval: { value: 5, unit: 'min' } })).toThrow(
      /must be below the cut-out/,
    )
    expect(() => leakRate({ ...cycle, precharge: psia(3100), interval: { value: 5, unit: 'min' } })).toThrow(
      /holds no fluid/,
    )
  })
})

describe('pre-charge loss from a unit\'s history', () => {
  const reference = { pressure: { value: 1000, unit: 'psi' as const, basis: 'gauge' as const }, temperature: room }
  const reading = (day: number, value: number, celsius = 20) => ({
    takenAt: new Date(Date.UTC(2026, 0, 1) + day * 86_400_000).toISOString(),
    pressure: { value, unit: 'psi' as const, basis: 'gauge' as const },
    temperature: { value: celsius, unit: 'C' as const },
  })

  it('a steady leak: slope and forecast by hand', () => {
    const result = prechargeTrend({
      reference,
      tolerance: { minus: 50, plus: 50, unit: 'psi' },
      readings: [0, 30, 60, 90].map(day => reading(day, 1000 - 0.5 * day)),
    })
    expect(result.lossRatePerDay).toBeCloseTo(-0.5, 8)
    expect(result.lossRateStandardError).toBeCloseTo(0, 8)
    // 1000 − 0.5 d = 950 at d = 100.
    expect(result.predictedOutOfLimitsAt).toBe(new Date(Date.UTC(2026, 0, 1) + 100 * 86_400_000).toISOString())
  })

  it('slope and its standard error for a noisy series, by hand: b = Sxy/Sxx = 7/5, SE = √(2.1/5)', () => {
    const result = prechargeTrend({
      reference,
      readings: [reading(0, 1010), reading(1, 1012), reading(2, 1011), reading(3, 1015)],
    })
    expect(result.lossRatePerDay).toBeCloseTo(1.4, 8)
    expect(result.lossRateStandardError).toBeCloseTo(Math.sqrt(2.1 / 5), 8)
    expect(result.predictedOutOfLimitsAt).toBeUndefined()
  })

  it('normalises each reading to the reference temperature, so cold mornings are not a leak', () => {
    // A tight unit read at −10, 20 and 40 °C: the readings differ, their normalised values do not. 3.5 psi/°C is
    // about Gay-Lussac's slope at this charge, by hand: (1000 + 14.7) psia / 293.15 K = 3.46 psi/K.
    const readings = [-10, 20, 40].map((celsius, index) => {
      const carried = 1000 + (celsius - 20) * 3.5
      return reading(index * 60, carried, celsius)
    })
    const result = prechargeTrend({ reference, readings, model: 'ideal' })
    const spread
      = Math.max(...result.normalised.map(point => point.value))
        - Math.min(...result.normalised.map(point => point.value))
    const rawSpread = 60 * 3.5
    expect(spread).toBeLessThan(0.1 * rawSpread)
  })
})

describe('pre-charge loss across recharges, and when it is flagged', () => {
  const reference = {
    pressure: { value: 1000, unit: 'psi' as const, basis: 'gauge' as const },
    temperature: { value: 20, unit: 'C' as const },
  }
  const at = (day: number, value: number, startsSegment = false) => ({
    takenAt: new Date(Date.UTC(2026, 0, 1) + day * 86_400_000).toISOString(),
    pressure: { value, unit: 'psi' as const, basis: 'gauge' as const },
    temperature: { value: 20, unit: 'C' as const },
    startsSegment,
  })
  const tolerance = { minus: 50, plus: 50, unit: 'psi' as const }

  it('a recharge mid-series: one common loss rate, by hand −0.5 psi/day, forecast from the latest segment', async () => {
    const readings = [at(0, 1000), at(30, 985), at(60, 970), at(60, 1000, true), at(90, 985), at(120, 970)]
    const trend = prechargeTrend({ reference, tolerance, readings })
    expect(trend.lossRatePerDay).toBeCloseTo(-0.5, 9)
    expect(trend.fit).toEqual({ readings: 6, segments: 2, degreesOfFreedom: 3 })
    expect(trend.lossRateStandardError).toBeCloseTo(0, 9)
    // Latest segment centred at day 90, 985 psi: 950 is reached at 90 + (950 − 985)/(−0.5) = day 160.
    expect(trend.predictedOutOfLimitsAt).toBe(new Date(Date.UTC(2026, 0, 1) + 160 * 86_400_000).toISOString())
    // Fitting one line through all six readings, as if no charge happened, would hide most of the leak.
    const naive = prechargeTrend({
      reference,
      tolerance,
      readings: readings.map(reading => ({ ...reading, startsSegment: false })),
    })
    expect(Math.abs(naive.lossRatePerDay!)).toBeLessThan(0.3)
  })

  it('agrees with simple-statistics on one segment (the package as a reference)', async () => {
    const values = [1004, 998, 1001, 990, 993, 985]
    const trend = prechargeTrend({ reference, readings: values.map((value, index) => at(index * 45, value)) })
    expect(trend.lossRatePerDay).toBeCloseTo(linearRegression(values.map((value, index) => [index * 45, value])).m, 12)
  })

  it('agrees with a least-squares fit of the full design matrix (one level per segment, one common slope), by mathjs', async () => {
    // Independent of the engine's closed form: solve the normal equations (XᵀX)β = Xᵀy directly, with mathjs as
    // the reference library (the engine does not use it for this fit).
    const readings = [
      at(0, 1003),
      at(40, 985),
      at(75, 972),
      at(75, 1001, true),
      at(120, 975),
      at(160, 957),
      at(160, 998, true),
      at(210, 972),
    ]
    const trend = prechargeTrend({ reference, readings })
    let segment = -1
    const rows = readings.map((reading, index) => {
      if (index === 0 || reading.startsSegment) segment++
      return {
        day: (Date.parse(reading.takenAt) - Date.parse(readings[0]!.takenAt)) / 86_400_000,
        segment,
        value: reading.pressure.value,
      }
    })
    const X = rows.map(row => [row.day, ...[0, 1, 2].map(level => (row.segment === level ? 1 : 0))])
    const y = rows.map(row => [row.value])
    const beta = lusolve(multiply(transpose(X), X), multiply(transpose(X), y)) as number[][]
    expect(trend.lossRatePerDay).toBeCloseTo(beta[0]![0]!, 9)
  })

  it('flags a steady leak; never a tight unit with noisy readings', async () => {
    const settings = { lossThresholdPerDay: 0.8, checkIntervalDays: 90, lastServiceAt: at(180, 0).takenAt }
    const leak = prechargeTrend({
      reference,
      tolerance,
      readings: [0, 45, 90, 135, 180].map(day => at(day, 1000 - 0.6 * day + (day % 2 ? 1 : -1))),
    })
    const leakFlag = assessUnitTrend(leak, settings)
    expect(leakFlag.flagged).toBe(true)
    expect(leakFlag.reasons.join(' ')).toMatch(/before the next scheduled check/)
    // Invented noise of ±4 psi around a constant charge, the size of a dial gauge's resolution.
    const noise = [3, -4, 2, -3, 4, -2, 1]
    const tight = prechargeTrend({
      reference,
      tolerance,
      readings: noise.map((offset, index) => at(index * 60, 1000 + offset)),
    })
    expect(
      assessUnitTrend(tight, { ...settings, lastServiceAt: at(360, 0).takenAt, lossThresholdPerDay: 0.01 }).flagged,
    ).toBe(false)
    const fast = prechargeTrend({
      reference,
      tolerance,
      readings: [0, 10, 20, 30].map(day => at(day, 1000 - 1.5 * day)),
    })
    expect(assessUnitTrend(fast, { ...settings, lastServiceAt: at(30, 0).takenAt }).reasons[0]).toMatch(
      /above the alert threshold/,
    )
  })
})
