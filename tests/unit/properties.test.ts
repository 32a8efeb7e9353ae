import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { chargeTarget } from '../../shared/gas/charge-target'
import { EngineInputError } from '../../shared/gas/errors'
import { requiredVolume, usableVolume } from '../../shared/gas/usable-volume'
import { leakRate } from '../../shared/gas/leakage'
import type { GasModel } from '../../shared/gas/types'

const models = fc.constantFrom<GasModel>('ideal', 'real')

/** A case whose target the real-gas model refuses (above 50 MPa) is outside the property, not a failure. */
function inRange<T>(calculate: () => T): T {
  try {
    return calculate()
  }
  catch (error) {
    if (error instanceof EngineInputError && /real-gas range/.test(error.message)) fc.pre(false)
    throw error
  }
}
/** Temperatures inside the real-gas range, °C. */
const celsius = fc.double({ min: -70, max: 120, noNaN: true })
const gaugePsi = (min: number, max: number) => fc.double({ min, max, noNaN: true })

describe('charge target properties', () => {
  it('correcting T1 → T2 → T1 returns the start', () => {
    fc.assert(
      fc.property(models, gaugePsi(50, 4000), celsius, celsius, (model, start, t1, t2) => {
        const there = inRange(() =>
          chargeTarget({
            reference: {
              pressure: { value: start, unit: 'psi', basis: 'gauge' },
              temperature: { value: t1, unit: 'C' },
            },
            gasTemperature: { value: t2, unit: 'C' },
            model,
          }),
        )
        const back = chargeTarget({
          reference: { pressure: there.target, temperature: { value: t2, unit: 'C' } },
          gasTemperature: { value: t1, unit: 'C' },
          model,
        })
        expect(back.target.value / start - 1).toBeCloseTo(0, 9)
      }),
    )
  })

  it('the target rises with the gas temperature', () => {
    fc.assert(
      fc.property(models, gaugePsi(50, 4000), celsius, celsius, (model, start, a, b) => {
        fc.pre(Math.abs(a - b) > 0.01)
        const at = (t: number) =>
          inRange(() =>
            chargeTarget({
              reference: {
                pressure: { value: start, unit: 'psi', basis: 'gauge' },
                temperature: { value: 21, unit: 'C' },
              },
              gasTemperature: { value: t, unit: 'C' },
              model,
            }),
          ).target.value
        expect(Math.sign(at(a) - at(b))).toBe(Math.sign(a - b))
      }),
    )
  })

  // Departure from the ideal gas is first order in pressure (the second virial coefficient), so the
  // two corrections agree within 3 % per MPa across −70…+120 °C: within 0.3 % at 0.1 MPa. (Z = 0.9998
  // for nitrogen at 0.1 MPa, 300 K: NIST Chemistry WebBook, from memory.)
  it('real and ideal agree below 1 MPa, closer as the pressure falls', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 1, noNaN: true }), celsius, celsius, (megapascals, t1, t2) => {
        const input = {
          reference: {
            pressure: { value: megapascals, unit: 'MPa' as const, basis: 'absolute' as const },
            temperature: { value: t1, unit: 'C' as const },
          },
          gasTemperature: { value: t2, unit: 'C' as const },
        }
        const real = chargeTarget({ ...input, model: 'real' }).target.value
        const ideal = chargeTarget({ ...input, model: 'ideal' }).target.value
        expect(Math.abs(real / ideal - 1)).toBeLessThan(0.03 * megapascals)
      }),
    )
  })
})

const sizingArbitrary = fc.record({
  model: models,
  precharge: gaugePsi(300, 1800),
  max: gaugePsi(2600, 4500),
  minShare: fc.double({ min: 0.4, max: 0.9, noNaN: true }),
  prechargeCelsius: fc.double({ min: -20, max: 40, noNaN: true }),
  operatingCelsius: fc.double({ min: -40, max: 70, noNaN: true }),
  discharge: fc.constantFrom('isothermal' as const, 'adiabatic' as const, { n: 1.25 }),
})

type SizingCase = typeof sizingArbitrary extends fc.Arbitrary<infer Case> ? Case : never

function sizingInput(case_: SizingCase, litres = 1) {
  return {
    gasVolume: { value: litres, unit: 'L' as const },
    precharge: { value: case_.precharge, unit: 'psi' as const, basis: 'gauge' as const },
    prechargeTemperature: { value: case_.prechargeCelsius, unit: 'C' as const },
    operatingTemperature: { value: case_.operatingCelsius, unit: 'C' as const },
    maxPressure: { value: case_.max, unit: 'psi' as const, basis: 'gauge' as const },
    minPressure: {
      value: Math.max(case_.precharge * 0.8, case_.max * case_.minShare),
      unit: 'psi' as const,
      basis: 'gauge' as const,
    },
    discharge: case_.discharge,
    model: case_.model,
  }
}

describe('sizing properties', () => {
  it('usable volume scales linearly with the gas volume', () => {
    fc.assert(
      fc.property(sizingArbitrary, fc.double({ min: 0.1, max: 50, noNaN: true }), (case_, litres) => {
        fc.pre(case_.max * case_.minShare < case_.max * 0.999 && case_.precharge * 0.8 < case_.max * 0.95)
        const one = usableVolume(sizingInput(case_, 1)).usableVolume.value
        const many = usableVolume(sizingInput(case_, litres)).usableVolume.value
        expect(many / litres).toBeCloseTo(one, 9)
      }),
      { numRuns: 60 },
    )
  })

  it('required-volume inverts usable-volume', () => {
    fc.assert(
      fc.property(sizingArbitrary, fc.double({ min: 0.01, max: 5, noNaN: true }), (case_, litres) => {
        fc.pre(case_.precharge * 0.8 < case_.max * 0.95)
        const { gasVolume: _gasVolume, ...conditions } = sizingInput(case_)
        const forward = usableVolume({ ...conditions, gasVolume: { value: litres, unit: 'L' } })
        // a usable share of at least 0.1 % (near zero the inverse is ill-conditioned)
        fc.pre(forward.usableVolume.value > 1e-3 * litres)
        const back = requiredVolume({ ...conditions, usable: forward.usableVolume })
        expect(back.gasVolume.value).toBeCloseTo(litres, 8)
      }),
      { numRuns: 60 },
    )
  })

  it('every input in range returns finite numbers', () => {
    fc.assert(
      fc.property(sizingArbitrary, (case_) => {
        fc.pre(case_.precharge * 0.8 < case_.max * 0.95)
        let result: ReturnType<typeof usableVolume>
        try {
          result = usableVolume({ ...sizingInput(case_), perApplication: { value: 0.01, unit: 'L' } })
        }
        catch (error) {
          // A pre-charge that, warmed to the operating temperature, reaches the maximum is refused by design
          // (1732 psig at −20 °C against 2600 psig at 70 °C, found by a run): not a case for this property.
          fc.pre(!(error instanceof EngineInputError && /reaches the maximum working pressure/.test(error.message)))
          throw error
        }
        for (const value of [
          result.usableVolume.value,
          result.gasVolumeAtMax.value,
          result.gasVolumeAtMin.value,
          result.residualPressure!.value,
          result.temperatureAtMin.value,
        ]) {
          expect(Number.isFinite(value)).toBe(true)
        }
        expect(result.gasVolumeAtMin.value).toBeLessThanOrEqual(1 + 1e-12)
        const leak = leakRate({
          gasVolume: { value: 1, unit: 'L' },
          precharge: sizingInput(case_).precharge,
          prechargeTemperature: { value: case_.prechargeCelsius, unit: 'C' },
          temperature: { value: case_.operatingCelsius, unit: 'C' },
          cutOut: sizingInput(case_).maxPressure,
          cutIn: sizingInput(case_).minPressure,
          interval: { value: 3, unit: 'min' },
          model: case_.model,
        })
        expect(Number.isFinite(leak.leakRate.value)).toBe(true)
      }),
      { numRuns: 80 },
    )
  })
})
