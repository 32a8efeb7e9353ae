import { beforeEach, describe, expect, it } from 'vitest'
import { effectScope, ref } from 'vue'
import { useChargeTarget, type ChargeTargetRequest } from '~~/composables/useChargeTarget'
import { fakeServer, refusal, type SentRequest, until } from './fake-server'

/**
 * The safety rule of the charge-target figures (composables/useChargeTarget.ts): a figure is shown only while
 * the inputs on screen are the ones it was computed for. An answer that arrives after the inputs changed is
 * never shown under the new ones; a refusal shows no figure, and names the field.
 */

let server: ReturnType<typeof fakeServer>
beforeEach(() => {
  server = fakeServer()
})

const request = (celsius: number): ChargeTargetRequest => ({
  target: {
    route: 'charge-target',
    body: { gasTemperature: { value: celsius, unit: 'C' }, ambient: { elevation: { value: 420, unit: 'ft' } } },
  } as unknown as ChargeTargetRequest['target'],
})

/** Answers held until the test lets each go, by the gas temperature asked for. */
function heldAnswers() {
  const waiting = new Map<number, (value: unknown) => void>()
  server.on('POST /api/calc/charge-target', ({ body }: SentRequest) => {
    const celsius = (body as { gasTemperature: { value: number } }).gasTemperature.value
    return new Promise(resolve => waiting.set(celsius, resolve))
  })
  return {
    asked: (celsius: number) => waiting.has(celsius),
    answer: (celsius: number, psig: number) => waiting.get(celsius)!({ target: { value: psig, unit: 'psi', basis: 'gauge' } }),
  }
}

function withScope<T>(run: () => T): T {
  return effectScope().run(run)!
}

describe('charge-target figures', () => {
  it('never shows an answer under inputs changed since it was asked for', async () => {
    const held = heldAnswers()
    const inputs = ref<ChargeTargetRequest | null>(request(15))
    const figures = withScope(() => useChargeTarget(inputs))
    await until(() => expect(held.asked(15)).toBe(true))
    inputs.value = request(30)
    held.answer(15, 1461.7)
    await until(() => expect(held.asked(30)).toBe(true))
    expect(figures.target.value).toBeNull()
    expect(figures.pending.value).toBe(true)
    held.answer(30, 1536.2)
    await until(() => expect(figures.target.value).toEqual({ target: { value: 1536.2, unit: 'psi', basis: 'gauge' } }))
    expect(figures.answered.value).toEqual(request(30))
    // Back to the first inputs: its old answer is not brought back, a new one is asked for.
    inputs.value = request(15)
    expect(figures.target.value).toBeNull()
  })

  it('shows no figure for a refused calculation, and names the field the refusal is about', async () => {
    server.on('POST /api/calc/charge-target', () => {
      throw Object.assign(refusal(422, 'A gas temperature is between −55 and 70 °C.'), {
        data: { message: 'A gas temperature is between −55 and 70 °C.', data: { field: 'gasTemperature' } },
      })
    })
    const figures = withScope(() => useChargeTarget(ref(request(95))))
    await until(() => expect(figures.error.value).toBe('A gas temperature is between −55 and 70 °C.'))
    expect(figures.errorField.value).toBe('gasTemperature')
    expect(figures.target.value).toBeNull()
    expect(figures.pending.value).toBe(false)
  })

  it('is not waiting on anything while the inputs are not a request (a field empty or unusable)', async () => {
    const figures = withScope(() => useChargeTarget(ref(null)))
    expect(figures.pending.value).toBe(false)
    expect(server.sent).toEqual([])
  })
})
