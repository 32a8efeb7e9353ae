import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { defineComponent, h, nextTick } from 'vue'
import { useSizingStudy, type SizingStudy } from '~~/composables/useSizingStudy'
import { studyFormSchema, toStudyInput } from '#shared/schemas/study'
import { computeStudy } from '#shared/utils/study'
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

  it('computes its results on the device with no signal, only ever for the inputs on screen', async () => {
    server.network.up = false
    const study = await newStudy()
    study.setFieldValue('name', 'Brake accumulator, cold soak')
    await until(() => expect(study.results.value).not.toBeNull())
    // The wiring, not the engine (tests/api/studies.test.ts checks a study's figures): the form's study is computed.
    const forInputs = () => computeStudy(toStudyInput(studyFormSchema.parse(study.values)))
    expect(study.results.value).toEqual(forInputs())
    study.setFieldValue('perApplication', 3)
    await nextTick()
    // Until it is computed again, the results of 2.5 in³ per application are not shown under 3.
    expect(study.results.value).toBeNull()
    await until(() => expect(study.results.value).not.toBeNull())
    expect(study.results.value).toEqual(forInputs())
    expect(server.sent.filter(request => request.url.startsWith('/api/calc'))).toEqual([])
  })
})
