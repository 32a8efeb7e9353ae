import { describe, expect, it } from 'vitest'
import { cycleTrend } from '../../shared/utils/cycle-check'
import { canChangeCycleCheck } from '../../shared/utils/cycle-check-rules'
import { gaugeAccuracy } from '../../shared/utils/tool-accuracy'
import { assessUnitTrend } from '../../shared/utils/trend-flags'
import { canCorrect, canDiscard, canEdit, canInspect, canVoid } from '../../shared/utils/worksheet-rules'
import type { WorksheetState } from '../../shared/types/worksheet'

/**
 * The rules the pages ask to offer an action and the routes ask to allow it, tested as plain functions: who may
 * fill, countersign, void, discard and correct a worksheet in each state, who may change a cycle check, when a
 * system's pump-cycle interval is flagged, when a unit's pre-charge trend is, and a gauge's accuracy.
 */

const technician = { id: 1, roles: ['technician'] as const }
const otherTechnician = { id: 2, roles: ['technician'] as const }
const inspector = { id: 3, roles: ['inspector'] as const }
const technicianInspector = { id: 1, roles: ['technician', 'inspector'] as const }
const admin = { id: 4, roles: ['admin'] as const }
const engineer = { id: 5, roles: ['engineer'] as const }
const STATES: WorksheetState[] = ['draft', 'awaiting-countersign', 'released', 'returned', 'voided']
const sheet = (state: WorksheetState, performerId = 1) => ({ state, performerId })
const outcome = (decision: { allowed: boolean, status?: number }) => (decision.allowed ? 'yes' : decision.status)

describe('worksheet rules', () => {
  it('lets only the performer fill a draft or a returned worksheet', () => {
    expect(STATES.map(state => outcome(canEdit(technician, sheet(state))))).toEqual(['yes', 409, 409, 'yes', 409])
    expect(outcome(canEdit(otherTechnician, sheet('draft')))).toBe(403)
    expect(canEdit(technician, sheet('voided'))).toMatchObject({ reason: expect.stringMatching(/voided/) })
    expect(canEdit(technician, sheet('released'))).toMatchObject({ reason: expect.stringMatching(/correction/) })
  })

  it('countersigning: an inspector who did not do the work, only while it awaits countersign', () => {
    expect(STATES.map(state => outcome(canInspect(inspector, sheet(state))))).toEqual([409, 'yes', 409, 409, 409])
    expect(outcome(canInspect(technician, sheet('awaiting-countersign', 2)))).toBe(403)
    // Independent inspection: the role is not enough when the inspector performed the work.
    expect(canInspect(technicianInspector, sheet('awaiting-countersign', 1)))
      .toMatchObject({ allowed: false, status: 403, reason: expect.stringMatching(/^Independent inspection/) })
  })

  it('voiding: an inspector or admin, of someone else’s work never released', () => {
    expect(STATES.map(state => outcome(canVoid(inspector, sheet(state))))).toEqual(['yes', 'yes', 409, 'yes', 409])
    expect(outcome(canVoid(admin, sheet('returned')))).toBe('yes')
    expect(outcome(canVoid(technician, sheet('draft', 2)))).toBe(403)
    expect(outcome(canVoid(technicianInspector, sheet('draft', 1)))).toBe(403)
    expect(canVoid(admin, sheet('released'))).toMatchObject({ reason: expect.stringMatching(/never voided/) })
  })

  it('discarding: the performer’s own draft, never signed', () => {
    expect(STATES.map(state => outcome(canDiscard(technician, sheet(state))))).toEqual(['yes', 409, 409, 409, 409])
    expect(outcome(canDiscard(otherTechnician, sheet('draft')))).toBe(403)
    expect(canDiscard(technician, sheet('returned'))).toMatchObject({ reason: expect.stringMatching(/signed once/) })
  })

  it('correcting: a technician, of a released worksheet only', () => {
    expect(STATES.map(state => outcome(canCorrect(otherTechnician, sheet(state))))).toEqual([409, 409, 'yes', 409, 409])
    expect(outcome(canCorrect(inspector, sheet('released')))).toBe(403)
  })
})

describe('cycle check rules', () => {
  it('the recorder or an engineer may change a check; nobody once it is withdrawn', () => {
    const check = { recordedById: 1, withdrawnAt: null }
    expect(outcome(canChangeCycleCheck(technician, check))).toBe('yes')
    expect(outcome(canChangeCycleCheck(engineer, check))).toBe('yes')
    expect(outcome(canChangeCycleCheck(otherTechnician, check))).toBe(403)
    expect(outcome(canChangeCycleCheck(engineer, { ...check, withdrawnAt: '2026-11-02T10:00:00Z' }))).toBe(409)
  })
})

describe('pump-cycle interval trend', () => {
  const check = (day: number, intervalSeconds: number) => ({
    checkedAt: `2026-11-${String(day).padStart(2, '0')}T08:00:00.000Z`,
    intervalSeconds,
    leakRate: { value: 0, unit: 'in3/min' },
  })
  const base = { aircraftId: 3, registration: 'QX-FMA', system: 'Hydraulic system A', accumulatorId: 31 }

  it('has no baseline before a first check and no drop before a fourth', () => {
    expect(cycleTrend({ ...base, checks: [] }, 0.25))
      .toMatchObject({ baselineSeconds: null, drop: null, flagged: false })
    const three = cycleTrend({ ...base, checks: [check(1, 100), check(2, 110), check(3, 120)] }, 0.25)
    expect(three).toMatchObject({ baselineSeconds: 110, latestSeconds: null, drop: null, flagged: false })
  })

  it('measures the latest against the mean of the first three, in date order whatever the order given', () => {
    // Baseline (100 + 110 + 120) / 3 = 110 s; latest 77 s: 1 − 77/110 = 0.30, above 0.25, flagged.
    const checks = [check(9, 77), check(2, 110), check(1, 100), check(3, 120), check(5, 105)]
    const trend = cycleTrend({ ...base, checks }, 0.25)
    expect(trend.checks.map(entry => entry.intervalSeconds)).toEqual([100, 110, 120, 105, 77])
    expect(trend.drop).toBeCloseTo(0.3, 12)
    expect(trend.flagged).toBe(true)
    expect(trend.message).toMatch(/^Cut-out to cut-in interval 30 % shorter than its baseline/)
    // Exactly at the share is not above it: 1 − 82.5/110 = 0.25.
    const atShare = [check(1, 100), check(2, 110), check(3, 120), check(4, 82.5)]
    expect(cycleTrend({ ...base, checks: atShare }, 0.25).flagged).toBe(false)
  })
})

describe('pre-charge trend flags', () => {
  const settings = { lossThresholdPerDay: 0.8, checkIntervalDays: 90, lastServiceAt: '2026-10-01T00:00:00.000Z' }
  const fit = { readings: 8, segments: 1, degreesOfFreedom: 6 }
  const trend = (lossRatePerDay: number, lossRateStandardError: number, predictedOutOfLimitsAt?: string) => ({
    lossRatePerDay, lossRateStandardError, fit, predictedOutOfLimitsAt, method: 'test', engineVersion: '0.0.0',
  })

  it('flags a loss above the threshold once it is clear of two standard errors', () => {
    // Losing 1.5 ± 0.2 a day: 1.5 − 0.4 = 1.1 > 0.8.
    const flag = assessUnitTrend(trend(-1.5, 0.2), settings)
    expect(flag).toMatchObject({ flagged: true, lossPerDay: 1.5, nextCheckAt: '2026-12-30T00:00:00.000Z' })
    expect(flag.reasons).toEqual(['Losing 1.50 ± 0.20 a day, above the alert threshold of 0.8 a day.'])
    // Losing 1.5 ± 0.5: 1.5 − 1.0 = 0.5, not clearly above 0.8: scatter alone never flags a unit.
    expect(assessUnitTrend(trend(-1.5, 0.5), settings).flagged).toBe(false)
  })

  it('flags a clear loss that leaves the band before the next scheduled check, and not one after it', () => {
    const before = assessUnitTrend(trend(-0.5, 0.1, '2026-12-20T00:00:00.000Z'), settings)
    expect(before.reasons).toEqual(['Predicted below the band on 2026-12-20, before the next scheduled check (2026-12-30).'])
    expect(assessUnitTrend(trend(-0.5, 0.1, '2027-01-05T00:00:00.000Z'), settings).flagged).toBe(false)
  })

  it('never flags a gaining unit, or a fit with no degrees of freedom', () => {
    expect(assessUnitTrend(trend(0.4, 0.1, '2026-12-20T00:00:00.000Z'), settings).flagged).toBe(false)
    const noFreedom = { ...trend(-3, 0), fit: { readings: 2, segments: 1, degreesOfFreedom: 0 } }
    expect(assessUnitTrend(noFreedom, settings).flagged).toBe(false)
  })
})

describe('gauge accuracy', () => {
  it('turns a share of full scale into ± in the range unit, and keeps a stated ±', () => {
    expect(gaugeAccuracy({ accuracy: 0.25, accuracyUnit: '%FS', rangeMax: 4000, rangeUnit: 'psi' })).toEqual({ value: 10, unit: 'psi' })
    expect(gaugeAccuracy({ accuracy: 0.5, accuracyUnit: 'bar', rangeMax: null, rangeUnit: null })).toEqual({ value: 0.5, unit: 'bar' })
    expect(gaugeAccuracy({ accuracy: 0.25, accuracyUnit: '%FS', rangeMax: null, rangeUnit: null })).toBeUndefined()
    expect(gaugeAccuracy({ accuracy: null, accuracyUnit: null, rangeMax: 4000, rangeUnit: 'psi' })).toBeUndefined()
  })
})
