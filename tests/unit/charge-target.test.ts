import { describe, expect, it } from 'vitest'
import { assessReading, chargeTarget, chargeTargetFromTable, correctionCurve } from '../../shared/gas/charge-target'
import { ENGINE_VERSION } from '../../shared/gas/version'

const psig = (value: number) => ({ value, unit: 'psi' as const, basis: 'gauge' as const })

describe('temperature-corrected pre-charge, ideal gas (Gay-Lussac)', () => {
  it('1000 psig at 70 °F reads 865.9 psig at 0 °F at sea level', () => {
    // Worked by hand from Gay-Lussac's law in absolute units: (1000 + 14.696) × 459.67 / 529.67 − 14.696.
    const result = chargeTarget({
      reference: { pressure: psig(1000), temperature: { value: 70, unit: 'F' } },
      gasTemperature: { value: 0, unit: 'F' },
      model: 'ideal',
    })
    expect(result.target.value).toBeCloseTo(865.9, 2)
    expect(result.method).toMatch(/Gay-Lussac/)
    expect(result.engineVersion).toBe(ENGINE_VERSION)
    expect(result.inputs.gasTemperature).toEqual({ value: 0, unit: 'F' })
  })

  it('changes about 1 % per 5 °F near room temperature', () => {
    // Common practice (no source): a nitrogen pre-charge moves about 1 % for every 5 °F.
    const result = chargeTarget({
      reference: { pressure: psig(1500), temperature: { value: 70, unit: 'F' } },
      gasTemperature: { value: 75, unit: 'F' },
      model: 'ideal',
    })
    const share = (result.target.value - 1500) / 1500
    expect(share).toBeGreaterThan(0.008)
    expect(share).toBeLessThan(0.011)
  })

  it('uses the local atmosphere: a gauge target differs at altitude', () => {
    const input = {
      reference: { pressure: psig(1000), temperature: { value: 21, unit: 'C' as const } },
      gasTemperature: { value: -20, unit: 'C' as const },
      model: 'ideal' as const,
    }
    const seaLevel = chargeTarget(input)
    const high = chargeTarget({ ...input, ambient: { elevation: { value: 2500, unit: 'm' } } })
    // Colder gas: the absolute pressure falls by T2/T1, and so does the atmosphere's share in it.
    expect(high.target.value).toBeGreaterThan(seaLevel.target.value)
    // 74.68 kPa at 2500 m, US Standard Atmosphere 1976
    expect(high.ambientPressure.value).toBeCloseTo(74.68 / 6.894757, 1)
  })

  it('carries both ends of the band the same way, with percent tolerances of the stated value', () => {
    const result = chargeTarget({
      reference: { pressure: psig(1000), temperature: { value: 21, unit: 'C' } },
      gasTemperature: { value: 21, unit: 'C' },
      tolerance: { minus: 5, plus: 10, unit: '%' },
    })
    expect(result.target.value).toBeCloseTo(1000, 8)
    expect(result.low!.value).toBeCloseTo(950, 8)
    expect(result.high!.value).toBeCloseTo(1100, 8)
  })
})

describe('real gas (Span et al. 2000) correction', () => {
  it('falls more than the ideal law at 7 MPa, where nitrogen has Z > 1', () => {
    const input = {
      reference: { pressure: psig(1000), temperature: { value: 21, unit: 'C' as const } },
      gasTemperature: { value: 0, unit: 'C' as const },
    }
    const real = chargeTarget(input).target.value
    const ideal = chargeTarget({ ...input, model: 'ideal' }).target.value
    // By hand (Gay-Lussac, absolute, at the standard sea-level atmosphere 14.696 psia = 101.325 kPa, US Standard
    // Atmosphere 1976): (1000 + 14.696) × 273.15 / 294.15 − 14.696 = 927.56 psig.
    expect(ideal).toBeCloseTo((1000 + 14.695949) * 273.15 / 294.15 - 14.695949, 6)
    expect(ideal).toBeCloseTo(927.56, 2)
    expect(real).toBeLessThan(ideal)
    expect(ideal - real).toBeGreaterThan(5)
    expect(ideal - real).toBeLessThan(20)
  })

  it('returns pressures in the unit and basis of the reference', () => {
    const result = chargeTarget({
      reference: { pressure: { value: 100, unit: 'bar', basis: 'absolute' }, temperature: { value: 20, unit: 'C' } },
      gasTemperature: { value: 40, unit: 'C' },
    })
    expect(result.target).toMatchObject({ unit: 'bar', basis: 'absolute' })
    expect(result.ambientPressure).toMatchObject({ unit: 'bar', basis: 'absolute' })
  })
})

describe('approved-data table', () => {
  const points = [
    { temperature: { value: -20, unit: 'C' as const }, pressure: psig(1280) },
    { temperature: { value: 0, unit: 'C' as const }, pressure: psig(1390) },
    { temperature: { value: 20, unit: 'C' as const }, pressure: psig(1500) },
  ]

  it('interpolates linearly between the two nearest points (by hand: 1390 + 110 × 5/20)', () => {
    const result = chargeTargetFromTable({
      points,
      gasTemperature: { value: 5, unit: 'C' },
      tolerance: { minus: 50, plus: 50, unit: 'psi' },
    })
    expect(result.target.value).toBeCloseTo(1417.5, 8)
    expect(result.low!.value).toBeCloseTo(1367.5, 8)
    expect(result.between.map(point => point.temperature.value)).toEqual([0, 20])
  })

  it('returns a table point exactly at its temperature, in any order of points, and in °F', () => {
    expect(
      chargeTargetFromTable({ points: [...points].reverse(), gasTemperature: { value: 32, unit: 'F' } }).target.value,
    ).toBeCloseTo(1390, 8)
    expect(chargeTargetFromTable({ points, gasTemperature: { value: -20, unit: 'C' } }).target.value).toBeCloseTo(
      1280,
      8,
    )
  })

  it('never extrapolates', () => {
    expect(() => chargeTargetFromTable({ points, gasTemperature: { value: 21, unit: 'C' } })).toThrow(
      /must not be extrapolated/,
    )
    expect(() => chargeTargetFromTable({ points, gasTemperature: { value: -25, unit: 'C' } })).toThrow(
      /outside the approved-data table/,
    )
  })
})

describe('curve and verdict', () => {
  it('gives a curve whose points agree with single targets', () => {
    const reference = { pressure: psig(1500), temperature: { value: 21, unit: 'C' as const } }
    const curve = correctionCurve({
      reference,
      from: { value: -55, unit: 'C' },
      to: { value: 70, unit: 'C' },
      points: 126,
      tolerance: { minus: 50, plus: 50, unit: 'psi' },
    })
    expect(curve.temperatures).toHaveLength(126)
    expect(curve.temperatures[55]).toBeCloseTo(0, 10)
    expect(curve.target[55]).toBeCloseTo(
      chargeTarget({ reference, gasTemperature: { value: 0, unit: 'C' } }).target.value,
      8,
    )
    expect(curve.low![0]).toBeLessThan(curve.target[0]!)
    // The curve's ends against a reference library: CoolProp 8.0.0 (HEOS nitrogen, Span et al. 2000), density
    // held from 1500 psig at 21 °C (and the band's ends from 1450 and 1550 psig) at the standard sea-level
    // atmosphere, computed for this test: −55 °C 1010.5506 psig, low 979.5134; 70 °C 1811.3963, high 1873.4933.
    expect(curve.target[0]).toBeCloseTo(1010.5506, 3)
    expect(curve.low![0]).toBeCloseTo(979.5134, 3)
    expect(curve.target[125]).toBeCloseTo(1811.3963, 3)
    expect(curve.high![125]).toBeCloseTo(1873.4933, 3)
  })

  it('says low, high or in limits, by how much, and warns within the gauge accuracy of a limit', () => {
    const band = { target: psig(1000), low: psig(950), high: psig(1050) }
    expect(assessReading({ ...band, reading: psig(930) })).toMatchObject({
      verdict: 'low',
      difference: -70,
      outsideBy: 20,
    })
    expect(assessReading({ ...band, reading: psig(1060) })).toMatchObject({ verdict: 'high', outsideBy: 10 })
    const near = assessReading({ ...band, reading: psig(955), gaugeAccuracy: { value: 10, unit: 'psi' } })
    expect(near).toMatchObject({ verdict: 'in-limits', nearLimit: true })
    expect(near.warnings[0]).toMatch(/gauge accuracy/)
    // A reading in bar against a target in psi is converted first: 69 bar = 1000.76 psi.
    expect(assessReading({ ...band, reading: { value: 69, unit: 'bar', basis: 'gauge' } }).difference).toBeCloseTo(
      0.76,
      2,
    )
  })
})

describe('range of the real-gas model', () => {
  it('refuses a target that would leave the validated range (above 50 MPa)', () => {
    expect(() =>
      chargeTarget({
        reference: { pressure: psig(6000), temperature: { value: 0, unit: 'C' } },
        gasTemperature: { value: 120, unit: 'C' },
      }),
    ).toThrow(/real-gas range/)
  })
})
