/**
 * Pump cycle checks are refused on their own fields (all problems at once), and can be corrected
 * or withdrawn by the one who recorded them or an engineer — each change compare-and-set, kept in
 * the audit trail, and carried into the system's trend.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'

const cookies = {} as Record<keyof typeof DEMO, string>
let aircraftId: number
const psig = (value: number) => ({ value, unit: 'psi', basis: 'gauge' })
const check = (seconds: number, extra: object = {}) => ({
  aircraftId, system: 'Hydraulic system 2', cutOut: psig(3000), cutIn: psig(2600), interval: { value: seconds, unit: 's' },
  fluidTemperature: { value: 40, unit: 'C' }, checkedAt: '2026-11-30', ...extra,
})

beforeAll(async () => {
  for (const [name, email] of Object.entries(DEMO)) cookies[name as keyof typeof DEMO] = await signIn(email)
  aircraftId = (await api('/api/aircraft?q=QX-FML', { cookie: cookies.technician })).body.items[0].id
})

describe('refusals', () => {
  it('names every bad field at once, in the unit typed: a 99,999-minute interval, cut-in above cut-out, boiling fluid', async () => {
    const answer = await api('/api/cycle-checks', { cookie: cookies.technician, body: check(0, { interval: { value: 99_999, unit: 'min' }, cutIn: psig(3200), fluidTemperature: { value: 400, unit: 'F' } }) })
    expect(answer.status).toBe(400)
    const fields = answer.body.data.issues.map((issue: { field: string }) => issue.field).sort()
    expect(fields).toEqual(['cutIn.value', 'fluidTemperature.value', 'interval.value'])
    expect(answer.body.message).toMatch(/between -76 and 302 °F/)
  })

  it('takes an interval given in hours within a day', async () => {
    expect((await api('/api/cycle-checks', { cookie: cookies.technician, body: check(0, { interval: { value: 0.2, unit: 'h' } }) })).status).toBe(201)
  })
})

describe('corrections and withdrawals', () => {
  it('the recorder corrects a slip; the leak rate is recomputed; an inspector may not; another technician may not', async () => {
    const created = await api('/api/cycle-checks', { cookie: cookies.technician, body: check(70) })
    expect(created.status).toBe(201)
    const corrected = await api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.technician, body: check(420), headers: { 'if-match': `"${created.body.version}"` } })
    expect(corrected.status).toBe(200)
    expect(corrected.body.intervalSeconds).toBe(420)
    // Six times the interval, a sixth of the leak rate (the same fluid released).
    expect(corrected.body.results.leakRate.value).toBeCloseTo(created.body.results.leakRate.value / 6, 6)
    expect(corrected.body.version).toBe(created.body.version + 1)
    expect((await api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.inspector, body: check(400) })).status).toBe(403)
    const other = await api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.lead, body: check(400) })
    expect(other.status).toBe(403)
    expect(other.body.message).toMatch(/Only the person who recorded this check, or an engineer/)
  })

  it('a correction made on an old version is refused (409), and two at once: one wins', async () => {
    const created = await api('/api/cycle-checks', { cookie: cookies.technician, body: check(300) })
    const stale = await api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.engineer, body: check(310), headers: { 'if-match': '"99"' } })
    expect(stale.status).toBe(409)
    const answers = await Promise.all([310, 320, 330, 340].map(seconds =>
      api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.engineer, body: check(seconds), headers: { 'if-match': `"${created.body.version}"` } })))
    expect(answers.map(answer => answer.status).sort()).toEqual([200, 409, 409, 409])
  })

  it('a withdrawn check is kept with its reason, leaves the trend, and cannot be changed again', async () => {
    const created = await api('/api/cycle-checks', { cookie: cookies.technician, body: check(65) })
    const before = (await api('/api/trends/cycles', { cookie: cookies.engineer })).body.items.find((item: { aircraftId: number, system: string }) => item.aircraftId === aircraftId && item.system === 'Hydraulic system 2')
    expect((await api(`/api/cycle-checks/${created.body.id}/withdraw`, { cookie: cookies.technician, body: { reason: 'x' } })).status).toBe(400)
    const withdrawn = await api(`/api/cycle-checks/${created.body.id}/withdraw`, { cookie: cookies.technician, body: { reason: 'Timed on the wrong system.' } })
    expect(withdrawn.status).toBe(200)
    expect(withdrawn.body).toMatchObject({ withdrawnReason: 'Timed on the wrong system.' })
    expect(withdrawn.body.withdrawnAt).toBeTruthy()
    const after = (await api('/api/trends/cycles', { cookie: cookies.engineer })).body.items.find((item: { aircraftId: number, system: string }) => item.aircraftId === aircraftId && item.system === 'Hydraulic system 2')
    expect(after.checks).toBe(before.checks - 1)
    expect((await api(`/api/cycle-checks/${created.body.id}`, { method: 'PATCH', cookie: cookies.engineer, body: check(70) })).status).toBe(409)
    const listed = (await api(`/api/cycle-checks?aircraftId=${aircraftId}&pageSize=100`, { cookie: cookies.inspector })).body.items.find((item: { id: number }) => item.id === created.body.id)
    expect(listed.withdrawnReason).toBe('Timed on the wrong system.')
    const verify = await api('/api/audit/verify', { cookie: cookies.admin })
    expect(verify.body.ok).toBe(true)
  })
})
