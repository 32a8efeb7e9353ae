import { beforeEach, describe, expect, it } from 'vitest'
import { effectScope, ref } from 'vue'
import type { ChargeTargetRequest } from '#shared/utils/charge-target-answer'
import { useChargeTarget } from '~~/composables/useChargeTarget'
import { fakeServer, until } from './fake-server'

/**
 * The charge-target figures (composables/useChargeTarget.ts) are computed on the device by the shared engine:
 * the same with the network cut, never a request, and always the figure for the inputs on screen (a refusal
 * shows no figure and names the field).
 */

let server: ReturnType<typeof fakeServer>
beforeEach(() => {
  server = fakeServer()
  server.network.up = false
})

const psig = (value: number) => ({ value, unit: 'psi', basis: 'gauge' }) as const
/** 1500 psig at 21 °C, −50/+50 psi, at a station at 420 ft, carried to the gas temperature given. */
const request = (celsius: number, asFound?: number): ChargeTargetRequest => ({
  target: {
    route: 'charge-target',
    body: {
      reference: { pressure: psig(1500), temperature: { value: 21, unit: 'C' } },
      gasTemperature: { value: celsius, unit: 'C' },
      ambient: { elevation: { value: 420, unit: 'ft' } },
      model: 'real',
      tolerance: { minus: 50, plus: 50, unit: 'psi' },
    },
  },
  ...(asFound ? { asFound: psig(asFound) } : {}),
})

function withScope<T>(run: () => T): T {
  return effectScope().run(run)!
}

describe('charge-target figures', () => {
  it('are computed on the device with no signal: the target, its band and the verdict', async () => {
    const figures = withScope(() => useChargeTarget(ref(request(15, 1400))))
    // The engine's part for this page loads with the first request.
    await until(() => expect(figures.target.value).not.toBeNull())
    // CoolProp 8.0.0 (HEOS nitrogen, Span et al. 2000): 1500 and 1450 psig at 21 °C carried to 15 °C at constant
    // density, gauge against the standard atmosphere at 420 ft (US Standard Atmosphere 1976).
    expect(figures.target.value!.target.value).toBeCloseTo(1461.690691, 5)
    expect(figures.target.value!.low!.value).toBeCloseTo(1413.170298, 5)
    expect(figures.assessment.value!.verdict).toBe('low')
    expect(figures.error.value).toBeNull()
    expect(server.sent).toEqual([])
  })

  it('follow the inputs at once: a figure is always the one for the inputs on screen', async () => {
    const inputs = ref<ChargeTargetRequest | null>(request(15))
    const figures = withScope(() => useChargeTarget(inputs))
    await until(() => expect(figures.target.value).not.toBeNull())
    const at15 = figures.target.value!.target.value
    inputs.value = request(30)
    expect(figures.target.value!.target.value).toBeGreaterThan(at15)
    expect(figures.answered.value).toEqual(request(30))
    inputs.value = null
    expect(figures.target.value).toBeNull()
    expect(figures.answered.value).toBeNull()
  })

  it('show no figure for input the engine refuses, and name the field the refusal is about', async () => {
    const figures = withScope(() => useChargeTarget(ref(request(-190))))
    await until(() => expect(figures.error.value).not.toBeNull())
    expect(figures.target.value).toBeNull()
    expect(figures.error.value).toMatch(/^-190.0 °C is outside the real-gas range/)
    expect(figures.errorField.value).toMatch(/gasTemperature/)
  })
})
