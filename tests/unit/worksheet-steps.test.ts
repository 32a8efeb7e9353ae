import { describe, expect, it } from 'vitest'
import type { WorksheetStepBody } from '../../shared/schemas/worksheet'
import type { WorksheetContent, WorksheetResults } from '../../shared/types/worksheet'
import {
  applyStep, freezeWorksheetContent, missingForSignature, settleUntil, StepRefusal, type StepContext,
} from '../../shared/utils/worksheet-steps'
import { AIRCRAFT, CART, celsius, GAUGE, psig, SPECIFICATION, STEPS_TO_AS_FOUND, UNIT } from '../support/worksheet-fixtures'

/**
 * The worksheet's step rules as the server and an offline tablet both run them (shared/utils/worksheet-steps.ts),
 * tested here without either: the order of steps, the tool register, the system-pressure and gauge-range refusals,
 * the settle time, an as-left that moved with nothing recorded, and what still stops a signature.
 */

const START = '2026-12-04T08:00:00.000Z'
const minutesAfter = (minutes: number) => new Date(Date.parse(START) + minutes * 60_000).toISOString()

function context(overrides: Partial<StepContext> = {}): StepContext {
  const tools = new Map([GAUGE, CART].map(tool => [tool.id, tool]))
  return { now: START, today: '2026-12-04', tool: id => tools.get(id), ...overrides }
}

function fresh() {
  return { content: freezeWorksheetContent(UNIT, AIRCRAFT, SPECIFICATION), results: {} as WorksheetResults }
}

function run(steps: WorksheetStepBody[], at: StepContext = context(), start = fresh()) {
  return steps.reduce((current, step) => applyStep(current, step, at), start)
}

function refusal(action: () => unknown): StepRefusal {
  try {
    action()
  }
  catch (error) {
    if (error instanceof StepRefusal) return error
    throw error
  }
  throw new Error('The step was accepted.')
}

describe('worksheet step rules (shared by server and device)', () => {
  it('freezes the specification without its register status, and the unit and aircraft as they were', () => {
    const { content } = fresh()
    expect(content.specification).not.toHaveProperty('status')
    expect(content.specification.referencePressure).toBe(1500)
    expect(content.accumulator).toEqual({ id: 31, partNumber: 'FA-2210-03', serialNumber: 'SN-4471', position: 'Main hydraulic, left wheel well' })
    expect(content.aircraft.registration).toBe('QX-FMA')
  })

  it('assesses the as-found against the target carried to the gas temperature (CoolProp 8.0.0 figures)', () => {
    const { content, results } = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1440) }])
    expect(content.asFound).toEqual({ reading: psig(1440), recordedAt: START })
    // CoolProp 8.0.0 (HEOS nitrogen, Span et al. 2000): 1500 and 1450 psig at 21 °C carried to 15 °C at constant
    // density, gauge against the standard atmosphere at 420 ft (US Standard Atmosphere 1976): 1461.690691, 1413.170298.
    expect(results.asFound!.target.value).toBeCloseTo(1461.690691, 5)
    expect(results.asFound!.low.value).toBeCloseTo(1413.170298, 5)
    expect(results.asFound!.assessment.verdict).toBe('in-limits')
    // 1400 psig is below 1413.17: low, by the difference worked by hand.
    const low = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1400) }]).results.asFound!
    expect(low.assessment.verdict).toBe('low')
  })

  it('stamps each preparation confirmation when first given and clears one withdrawn', () => {
    const first = run([{ step: 'preparation', systemDepressurised: true, aircraftSafe: true }])
    expect(first.content.preparation).toEqual({ systemDepressurised: START, aircraftSafe: START })
    const later = applyStep(first, { step: 'preparation', aircraftSafe: false, eyeProtection: true }, context({ now: minutesAfter(5) }))
    expect(later.content.preparation).toEqual({ systemDepressurised: START, eyeProtection: minutesAfter(5) })
  })

  it('refuses a reading before the preparation, the tools or the conditions, with 409 on the step', () => {
    const early = refusal(() => run([{ step: 'asFound', reading: psig(1450) }]))
    expect([early.status, early.field]).toEqual([409, 'step'])
    expect(early.message).toMatch(/preparation/)
    const noTools = refusal(() => run([STEPS_TO_AS_FOUND[0]!, { step: 'asFound', reading: psig(1450) }]))
    expect(noTools.message).toMatch(/gauge and cart/)
    const noConditions = refusal(() => run([...STEPS_TO_AS_FOUND.slice(0, 2), { step: 'asFound', reading: psig(1450) }]))
    expect(noConditions.message).toMatch(/conditions/)
    expect(refusal(() => run([{ step: 'action', kind: 'none' }])).message).toMatch(/as-found/)
    expect(refusal(() => run([{ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: '', unserviceableReference: null }])).status).toBe(409)
  })

  it('takes a gauge to the end of its due day at the station, and refuses it the day after', () => {
    const tools = { step: 'tools', gaugeId: GAUGE.id, cartId: CART.id } as const
    expect(run([tools], context({ today: '2026-12-31' })).content.tools!.gauge.calibrationDue).toBe('2026-12-31')
    const expired = refusal(() => run([tools], context({ today: '2027-01-01' })))
    expect(expired.field).toBe('gaugeId')
    expect(expired.message).toMatch(/GA-0141: calibration expired/)
  })

  it('refuses a gauge with no calibration record, an inactive cart, and a tool of the wrong kind', () => {
    const uncalibrated = { ...GAUGE, calibrationDue: null }
    expect(refusal(() => run([{ step: 'tools', gaugeId: GAUGE.id, cartId: CART.id }], context({ tool: id => (id === GAUGE.id ? uncalibrated : CART) }))).message)
      .toMatch(/no calibration record/)
    expect(refusal(() => run([{ step: 'tools', gaugeId: GAUGE.id, cartId: CART.id }], context({ tool: id => (id === CART.id ? { ...CART, active: false } : GAUGE) }))).field)
      .toBe('cartId')
    expect(refusal(() => run([{ step: 'tools', gaugeId: CART.id, cartId: CART.id }])).field).toBe('gaugeId')
  })

  it('keeps the gauge accuracy the tool register gives: 0.25 % of a 4000 psi scale is ±10 psi', () => {
    expect(run(STEPS_TO_AS_FOUND).content.tools!.gauge.accuracy).toEqual({ value: 10, unit: 'psi' })
  })

  it('refuses a reading above the maximum working pressure as system pressure, in the unit typed', () => {
    const high = refusal(() => run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(3050) }]))
    expect(high.field).toBe('reading.value')
    expect(high.message).toMatch(/^3050 psi is above the unit's maximum working pressure \(3000 psi\)/)
    // 210 bar is 3045.8 psi (1 bar = 14.503774 psi, NIST SP 811 appendix B.8): above 3000 psi, refused too.
    const inBar = refusal(() => run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: { value: 210, unit: 'bar', basis: 'gauge' } }]))
    expect(inBar.message).toMatch(/^210 bar is above/)
  })

  it('refuses a reading beyond the gauge’s range', () => {
    const small = { ...GAUGE, rangeMax: 1000 }
    const beyond = refusal(() =>
      run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1450) }], context({ tool: id => (id === GAUGE.id ? small : CART) })))
    expect(beyond.message).toMatch(/beyond the range of gauge GA-0141 \(1000 psi\)/)
  })

  it('drops the as-found when the conditions change, and the as-left when the action changes', () => {
    const found = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1450) }, { step: 'action', kind: 'none' }])
    const again = applyStep(found, { ...(STEPS_TO_AS_FOUND[2] as WorksheetStepBody & { step: 'conditions' }), gasTemperature: celsius(20) }, context())
    expect(again.content.asFound).toBeUndefined()
    expect(again.results.asFound).toBeUndefined()
    const left = run([{ step: 'asLeft', reading: psig(1455), gasTemperature: celsius(15) }], context(), found)
    expect(left.results.asLeft).toBeDefined()
    const recharged = applyStep(left, { step: 'action', kind: 'charge' }, context({ now: minutesAfter(1) }))
    expect(recharged.content.asLeft).toBeUndefined()
  })

  it('holds the as-left until the gas has settled after a charge, counting the minutes left', () => {
    const charged = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1300) }, { step: 'action', kind: 'charge' }])
    expect(settleUntil(charged.content)).toBe(minutesAfter(15))
    const asLeft = { step: 'asLeft', reading: psig(1460), gasTemperature: celsius(15) } as const
    const early = refusal(() => applyStep(charged, asLeft, context({ now: minutesAfter(10) })))
    expect([early.status, early.field]).toEqual([409, 'reading'])
    expect(early.message).toMatch(/5 more minute\(s\) \(settle time 15 min\)/)
    expect(applyStep(charged, asLeft, context({ now: minutesAfter(15) })).results.asLeft!.assessment.verdict).toBe('in-limits')
  })

  it('asks for the action or a confirmation when the as-left moved with no charge or vent recorded', () => {
    const none = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1440) }, { step: 'action', kind: 'none' }])
    // Moved 40 psi at the same temperature: beyond twice the gauge's ±10 psi and beyond 1 % of 1461.7 (14.6 psi).
    const moved = refusal(() => applyStep(none, { step: 'asLeft', reading: psig(1480), gasTemperature: celsius(15) }, context()))
    expect(moved.field).toBe('reading.value')
    expect(moved.extra).toEqual({ confirm: 'confirmedUnchanged' })
    expect(moved.message).toMatch(/^The as-left is 40\.0 psi away from the as-found/)
    // 15 psi is within 20 psi (twice the gauge accuracy): taken as unchanged.
    expect(applyStep(none, { step: 'asLeft', reading: psig(1455), gasTemperature: celsius(15) }, context()).content.asLeft).toBeDefined()
    const confirmed = applyStep(none, { step: 'asLeft', reading: psig(1480), gasTemperature: celsius(15), confirmedUnchanged: true }, context())
    expect(confirmed.content.asLeft!.confirmedUnchanged).toBe(true)
  })

  it('lists what still stops the signature, and asks for a defect reference when the as-left is out of limits', () => {
    const start = fresh()
    expect(missingForSignature(start.content, start.results)).toEqual([
      'every preparation confirmation', 'the gauge and nitrogen cart', 'the conditions', 'the as-found reading',
      'the action', 'the as-left reading', 'the finishing checks',
    ])
    const finish = { step: 'finish', valveLeakCheck: true, capFitted: true, remarks: '', unserviceableReference: null } as const
    const inLimits = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1440) }, { step: 'action', kind: 'none' },
      { step: 'asLeft', reading: psig(1445), gasTemperature: celsius(15) }, finish])
    expect(missingForSignature(inLimits.content, inLimits.results)).toEqual([])
    const outOfLimits = run([...STEPS_TO_AS_FOUND, { step: 'asFound', reading: psig(1300) }, { step: 'action', kind: 'none' },
      { step: 'asLeft', reading: psig(1300), gasTemperature: celsius(15) }, finish])
    expect(missingForSignature(outOfLimits.content, outOfLimits.results)).toEqual([
      expect.stringMatching(/^a defect or deferral reference/),
    ])
    const withReference = applyStep(outOfLimits, { ...finish, unserviceableReference: 'DD-2026-118' }, context())
    expect(missingForSignature(withReference.content, withReference.results)).toEqual([])
  })

  it('asks for a review of what changed when an offline worksheet reached the server, and only then', () => {
    expect(refusal(() => run([{ step: 'reviewSync', reviewed: true }])).status).toBe(409)
    const synced = fresh()
    const content: WorksheetContent = { ...synced.content, offline: { clientId: 'c-1', startedAt: START, syncedAt: START, conflicts: ['The gauge changed.'] } }
    expect(missingForSignature(content, {})).toContain('your review of what changed when the worksheet was sent from the device')
    const reviewed = applyStep({ content, results: {} }, { step: 'reviewSync', reviewed: true }, context())
    expect(reviewed.content.offline!.reviewedAt).toBe(START)
    expect(missingForSignature(reviewed.content, {})).not.toContain('your review of what changed when the worksheet was sent from the device')
  })

  it('never changes the worksheet it is given', () => {
    const before = run(STEPS_TO_AS_FOUND)
    const copy = structuredClone(before)
    applyStep(before, { step: 'asFound', reading: psig(1450) }, context())
    expect(before).toEqual(copy)
  })
})
