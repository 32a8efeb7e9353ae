import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { defineComponent, h, nextTick } from 'vue'
import { useSizingStudy, type SizingStudy } from '~~/composables/useSizingStudy'
import { SPECIFICATION } from '../support/worksheet-fixtures'
import { fakeServer, until } from './fake-server'

/**
 * A sizing study's data (composables/useSizingStudy.ts) in the Nuxt runtime: a unit switch converts the
 * pressures (never relabels them), a linked specification's figures arrive in the study's unit, and results
 * show only for the inputs on screen.
 */

let server: ReturnType<typeof fakeServer>
beforeEach(() => {
  server = fakeServer()
  server.on('GET /api/specifications', () => ({ items: [SPECIFICATION] }))
  setActivePinia(createPinia())
})

async function newStudy(): Promise<SizingStudy> {
  let study: SizingStudy | undefined
  await mountSuspended(defineComponent({
    async setup() {
      study = await useSizingStudy(null, null)
      return () => h('div')
    },
  }))
  return study!
}

describe('a sizing study', () => {
  it('converts its pressures when the pressure unit changes: 1000 psi is 68.9476 bar, not 1000 bar', async () => {
    const study = await newStudy()
    expect([study.values.precharge, study.values.maxPressure, study.values.pressureUnit]).toEqual([1000, 3000, 'psi'])
    study.setFieldValue('pressureUnit', 'bar')
    await nextTick()
    // 1 psi = 0.0689475729 bar (NIST SP 811 appendix B.8): 68.9476 and 206.843 bar to six figures.
    expect(study.values.precharge).toBe(68.9476)
    expect(study.values.maxPressure).toBe(206.843)
    expect(study.values.minPressure).toBe(103.421)
  })

  it('fills in a linked specification’s figures in the study’s own unit', async () => {
    const study = await newStudy()
    study.setFieldValue('pressureUnit', 'bar')
    await nextTick()
    study.linkSpecification(SPECIFICATION.id)
    await nextTick()
    // FA-2210-03: 1500 psig pre-charge, 3000 / 1800 psig working pressures, 120 in³ of gas at 21 °C.
    expect(study.values).toMatchObject({
      specificationId: SPECIFICATION.id, accumulatorType: 'piston', basis: 'gauge',
      precharge: 103.42, maxPressure: 206.84, minPressure: 124.11, gasVolume: 120, prechargeTemperature: 21,
      name: 'FA-2210-03 rev C',
    })
  })

  it('shows results only for the inputs on screen', async () => {
    // Each request is held, by the volume per application it was asked for, until the test answers it.
    const held = new Map<number, (value: unknown) => void>()
    server.on('POST /api/calc/study', ({ body }) => new Promise((resolve) => {
      held.set((body as { perApplication: { value: number } }).perApplication.value, resolve)
    }))
    const answer = (perApplication: number, method: string) =>
      held.get(perApplication)!({ rows: [], method, engineVersion: '0.0.0' })
    const study = await newStudy()
    await until(() => expect(held.has(2.5)).toBe(true))
    study.setFieldValue('perApplication', 3)
    await nextTick()
    answer(2.5, 'for the earlier inputs')
    await until(() => expect(held.has(3)).toBe(true))
    expect(study.results.value).toBeNull()
    answer(3, 'for these inputs')
    await until(() => expect(study.results.value?.method).toBe('for these inputs'))
  })
})
