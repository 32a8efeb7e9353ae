import { describe, expect, it } from 'vitest'
import {
  dischargeCurve, optimumPrecharge, requiredVolume, usableVolume, usableVolumeEnvelope,
} from '../../shared/gas/usable-volume'

const psia = (value: number) => ({ value, unit: 'psi' as const, basis: 'absolute' as const })
const psig = (value: number) => ({ value, unit: 'psi' as const, basis: 'gauge' as const })
const room = { value: 20, unit: 'C' as const }

/**
 * From memory: the usual fluid-power textbook sizing example — one volume of gas (the book says a
 * gallon; here 1 L, the ratios are the same) pre-charged to 1000 psia, working between 3000 and
 * 2000 psia. Boyle's law gives V₃₀₀₀ = 1/3, V₂₀₀₀ = 1/2 and 1/6 of the gas volume usable
 * (isothermal); with p·V^1.4 = const on discharge, V₂₀₀₀ = (1/3)·1.5^(1/1.4) and 0.1120 usable.
 */
const textbook = {
  gasVolume: { value: 1, unit: 'L' as const },
  precharge: psia(1000),
  prechargeTemperature: room,
  maxPressure: psia(3000),
  minPressure: psia(2000),
  model: 'ideal' as const,
}

describe('usable volume, ideal gas', () => {
  it('isothermal both ways: 1/6 of the gas volume', () => {
    const result = usableVolume({ ...textbook, discharge: 'isothermal' })
    expect(result.gasVolumeAtMax.value).toBeCloseTo(1 / 3, 10)
    expect(result.gasVolumeAtMin.value).toBeCloseTo(1 / 2, 10)
    expect(result.usableVolume.value).toBeCloseTo(1 / 6, 10)
    expect(result.method).toMatch(/Boyle/)
  })

  it('isothermal charge, adiabatic discharge: 0.1120 of the gas volume', () => {
    const result = usableVolume(textbook)
    expect(result.usableVolume.value).toBeCloseTo(0.11197, 4)
    // Adiabatic expansion cools the gas: T₂ = T₁ (p₂/p₁)^((n−1)/n) = 293.15 × (2/3)^0.2857 = 261.08 K.
    expect(result.temperatureAtMin.value).toBeCloseTo(261.08 - 273.15, 1)
  })

  it('a custom polytropic exponent lies between the two', () => {
    const result = usableVolume({ ...textbook, discharge: { n: 1.2 } })
    expect(result.usableVolume.value).toBeGreaterThan(0.11197)
    expect(result.usableVolume.value).toBeLessThan(1 / 6)
  })

  it('counts whole applications and the pressure after the last (by hand: 8 × 0.02 L, p = 3000 × (1/3)/(1/3 + 0.16))', () => {
    const result = usableVolume({ ...textbook, discharge: 'isothermal', perApplication: { value: 0.02, unit: 'L' } })
    expect(result.applications).toBe(8)
    expect(result.residualPressure!.value).toBeCloseTo(1000 / (1 / 3 + 0.16), 6)
  })

  it('caps the gas volume at the pre-charge volume when the separator bottoms out, and says so', () => {
    const result = usableVolume({ ...textbook, precharge: psia(2500), discharge: 'isothermal' })
    expect(result.gasVolumeAtMin.value).toBeCloseTo(1, 10)
    expect(result.usableVolume.value).toBeCloseTo(1 - 2500 / 3000, 10)
    expect(result.bottomOutPressure!.value).toBeCloseTo(2500, 6)
    expect(result.warnings.join(' ')).toMatch(/bottoms out/)
  })

  it('warms the pre-charge to the operating temperature at constant volume first', () => {
    const hot = usableVolume({ ...textbook, discharge: 'isothermal', operatingTemperature: { value: 50, unit: 'C' } })
    expect(hot.prechargeAtOperatingTemperature.value).toBeCloseTo((1000 * 323.15) / 293.15, 6)
  })

  it('refuses impossible limits', () => {
    expect(() => usableVolume({ ...textbook, minPressure: psia(3500) })).toThrow(/must be below the maximum/)
    expect(() => usableVolume({ ...textbook, precharge: psia(3200) })).toThrow(/reaches the maximum working pressure/)
  })
})

describe('real gas sizing', () => {
  it('gives less usable fluid than the ideal law at 20 MPa (Z > 1, cp/cv > 1.4)', () => {
    const ideal = usableVolume(textbook).usableVolume.value
    const real = usableVolume({ ...textbook, model: 'real' }).usableVolume.value
    expect(real).toBeLessThan(ideal)
    expect(real).toBeGreaterThan(0.5 * ideal)
  })

  it('a brake accumulator on a cold-soaked day gives fewer applications', () => {
    const brake = {
      gasVolume: { value: 60, unit: 'in3' as const },
      precharge: psig(1000),
      prechargeTemperature: { value: 21, unit: 'C' as const },
      maxPressure: psig(3000),
      minPressure: psig(1500),
      perApplication: { value: 2.5, unit: 'in3' as const },
    }
    const envelope = usableVolumeEnvelope({
      ...brake,
      temperatures: [
        { label: 'Cold soak', temperature: { value: -40, unit: 'C' } },
        { label: 'Standard day', temperature: { value: 15, unit: 'C' } },
        { label: 'Hot day', temperature: { value: 50, unit: 'C' } },
      ],
    })
    const applications = envelope.rows.map(row => ('result' in row ? row.result.applications! : -1))
    expect(applications[0]).toBeLessThan(applications[1]!)
    expect(applications.every(count => count > 0)).toBe(true)
  })
})

describe('inverse and optimum', () => {
  it('required volume gives back the demanded applications exactly', () => {
    const result = requiredVolume({
      ...textbook,
      model: 'real',
      applications: 12,
      perApplication: { value: 10, unit: 'in3' },
    })
    expect(result.gasVolume.unit).toBe('in3')
    expect(result.check.applications).toBe(12)
    expect(result.check.usableVolume.value).toBeCloseTo(120, 6)
  })

  it('the optimum pre-charge for isothermal charge and discharge is the minimum pressure', () => {
    // Ideal, isothermal: usable = V₀·p₀(1/p_min − 1/p_max) until the separator stops at p_min, so p₀ = p_min.
    const result = optimumPrecharge({ ...textbook, discharge: 'isothermal' })
    expect(result.precharge.value).toBeCloseTo(2000, 3)
    expect(result.usableVolume.value).toBeCloseTo(1 / 3, 6)
  })

  it('with adiabatic discharge it is p_max·(p_min/p_max)^(1/1.4)', () => {
    const result = optimumPrecharge(textbook)
    expect(result.precharge.value).toBeCloseTo(3000 * (2 / 3) ** (1 / 1.4), 3)
    expect(result.atBound).toBe(false)
  })

  it('matches a brute-force search over pre-charges, across processes and temperatures (real gas)', () => {
    // Brute force: the usable-volume calculation itself at 3,000 pre-charges from 1 % of the maximum pressure to
    // three times it, skipping those it refuses (no fluid enters, or a state outside the equation of state).
    const base = {
      gasVolume: { value: 100, unit: 'in3' as const },
      prechargeTemperature: { value: 21, unit: 'C' as const },
      maxPressure: psig(3000),
      minPressure: psig(1800),
      model: 'real' as const,
    }
    const processes = [
      { charge: 'isothermal' as const, discharge: 'isothermal' as const },
      { charge: 'isothermal' as const, discharge: 'adiabatic' as const },
      { charge: 'adiabatic' as const, discharge: 'adiabatic' as const },
      { charge: { n: 1.2 }, discharge: { n: 1.3 } },
    ]
    for (const process of processes) {
      for (const operating of [-54, 21, 71]) {
        const conditions = { ...base, ...process, operatingTemperature: { value: operating, unit: 'C' as const } }
        const optimum = optimumPrecharge(conditions)
        let best = { precharge: 0, usable: -1 }
        for (let step = 1; step <= 3000; step++) {
          const precharge = psig(3000 * 0.01 + (step / 3000) * 6000)
          let usable: number
          try {
            usable = usableVolume({ ...conditions, precharge }).usableVolume.value
          }
          catch {
            continue
          }
          if (usable > best.usable) best = { precharge: precharge.value, usable }
        }
        const label = `${JSON.stringify(process)} at ${operating} °C`
        expect(optimum.usableVolume.value, label).toBeGreaterThanOrEqual(best.usable - 1e-9)
        expect(Math.abs(optimum.precharge.value - best.precharge), label).toBeLessThanOrEqual(2)
        // The route agrees with itself: usable volume at the optimum pre-charge is the optimum's volume.
        expect(usableVolume({ ...conditions, precharge: optimum.precharge }).usableVolume.value, label)
          .toBeCloseTo(optimum.usableVolume.value, 6)
      }
    }
  })

  it('judges the pre-charge at the operating temperature in both routes, and searches beyond the maximum when cold', () => {
    // 100 in³, pre-charged at 21 °C, working at −54 °C between 3000 and 1800 psig: at −54 °C the gas of a
    // 3050 psig pre-charge sits far below 3000 psig, so fluid enters; the optimum lies above 3000 psig at 21 °C.
    const cold = {
      gasVolume: { value: 100, unit: 'in3' as const },
      prechargeTemperature: { value: 21, unit: 'C' as const },
      operatingTemperature: { value: -54, unit: 'C' as const },
      maxPressure: psig(3000),
      minPressure: psig(1800),
    }
    expect(usableVolume({ ...cold, precharge: psig(3050) }).usableVolume.value).toBeGreaterThan(0)
    const optimum = optimumPrecharge(cold)
    expect(optimum.precharge.value).toBeGreaterThan(3000)
    expect(optimum.prechargeAtOperatingTemperature.value).toBeLessThan(3000)
    expect(optimum.atBound).toBe(false)
    expect(optimum.warnings.join(' ')).toMatch(/at or above the maximum working pressure/)
    expect(optimum.searched.high.value).toBeGreaterThan(optimum.precharge.value)
  })

  it('skips a trial pre-charge the method cannot compute instead of refusing the request', () => {
    // Adiabatic charge and discharge between 5000 and 100 psig at 71 °C: deep expansions from low pre-charges
    // cool the gas below the equation of state's range (−143 °C).
    const result = optimumPrecharge({
      gasVolume: { value: 100, unit: 'in3' },
      prechargeTemperature: { value: 71, unit: 'C' },
      maxPressure: psig(5000),
      minPressure: psig(100),
      charge: 'adiabatic',
    })
    expect(result.usableVolume.value).toBeGreaterThan(0)
    expect(result.warnings.join(' ')).toMatch(/skipped/)
  })
})

describe('curves for the sizing plots', () => {
  it('the discharge curve runs from the maximum to the minimum pressure, with applications as steps on it', async () => {
    const curve = dischargeCurve({
      ...textbook,
      discharge: 'isothermal',
      perApplication: { value: 0.02, unit: 'L' },
      points: 11,
    })
    expect(curve.pressure[0]).toBeCloseTo(3000, 6)
    expect(curve.pressure.at(-1)).toBeCloseTo(2000, 6)
    expect(curve.delivered.at(-1)).toBeCloseTo(1 / 6, 10)
    expect(curve.applications).toHaveLength(8)
    // Boyle: after n applications p = 3000 × (1/3) / (1/3 + 0.02 n), by hand.
    expect(curve.applications[2]!.pressure).toBeCloseTo(1000 / (1 / 3 + 0.06), 6)
  })

  it('the pre-charge sweep peaks at the optimum', async () => {
    const { prechargeSweep } = await import('../../shared/gas/usable-volume')
    const sweep = prechargeSweep({ ...textbook, discharge: 'isothermal', points: 81 })
    const best = Math.max(...sweep.usable)
    expect(sweep.optimum.usableVolume.value).toBeGreaterThanOrEqual(best - 1e-9)
    expect(sweep.optimum.precharge.value).toBeCloseTo(2000, 3)
    expect(sweep.usable.at(-1)).toBeLessThan(0.01)
  })

  it('warns beyond the usual compression ratio for a bladder (common practice 4:1)', async () => {
    const { compressionRatioWarnings } = await import('../../shared/gas/usable-volume')
    const low = usableVolume({ ...textbook, precharge: psia(600) })
    expect(compressionRatioWarnings(low, 'bladder')[0]).toMatch(/5\.0:1 .* usual 4:1 for a bladder/)
    expect(compressionRatioWarnings(low, 'piston')).toEqual([])
  })
})
