import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { api, DEMO, DEMO_PASSWORD, signIn, upload } from '../support/api'
import { fillWorksheet, finishAndSign, GAS_TEMPERATURE, toolId, unitAt } from '../support/worksheet-flow'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
})

async function inbox() {
  return (await api('/api/admin/outbox', { cookie: cookies.admin })).body as { received: { to: string[], subject: string, text: string }[], notifications: { recipient: string, subject: string, status: string }[] }
}

describe('filling a worksheet', () => {
  it('freezes the specification, recomputes the as-found on the server, and stamps each preparation', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMA', /Main hydraulic/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    expect(flow.created.state).toBe('draft')
    expect(flow.created.content.specification).toMatchObject({ partNumber: 'FA-2210-03', revision: 'C', dataReference: 'TW46 SMM 29-11-10' })
    const results = flow.afterAsFound.results.asFound
    // From outside the engine: CoolProp 8.0.0 (HEOS nitrogen, Span et al. 2000) carrying 1500 psig and its
    // 1450 psig low limit at 21 °C to 15 °C at constant density, gauge against 99,796.55 Pa (the standard
    // atmosphere at 420 ft, US Standard Atmosphere 1976): 1461.690691 and 1413.170298 psig.
    expect(results.target.value).toBeCloseTo(1461.690691, 5)
    expect(results.low.value).toBeCloseTo(1413.170298, 5)
    expect(results.assessment.verdict).toBe('in-limits')
    expect(results.engineVersion).toMatch(/^\d+\.\d+\.\d+$/)
    expect(Object.values(flow.afterAsFound.content.preparation).every(value => typeof value === 'string' && !Number.isNaN(Date.parse(value as string)))).toBe(true)
    expect(flow.afterAsFound.content.tools.gauge.accuracy).toEqual({ value: 10, unit: 'psi' })
  })

  it('refuses a gauge whose calibration has expired, with the reason', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMB', /Main hydraulic/)
    const created = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: unit.id, workOrder: 'WO-EXPIRED', reason: 'defect' } })
    const answer = await api(`/api/worksheets/${created.body.id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'tools', gaugeId: await toolId(cookies.technician!, 'GA-0098'), cartId: await toolId(cookies.technician!, 'NC-07') } })
    expect(answer.status).toBe(422)
    expect(answer.body.message).toMatch(/GA-0098: calibration expired/)
    expect(answer.body.data.field).toBe('gaugeId')
  })

  it('will not take an as-found reading before the system is confirmed depressurised', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMB', /Normal brake/)
    const created = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: unit.id, workOrder: 'WO-ORDER', reason: 'scheduled' } })
    const answer = await api(`/api/worksheets/${created.body.id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'asFound', reading: { value: 1000, unit: 'psi', basis: 'gauge' } } })
    expect(answer.status).toBe(409)
    expect(answer.body.message).toMatch(/depressurised/)
  })

  it('names the field for bad step input, and keeps the worksheet as it was', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMB', /Emergency/)
    const created = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: unit.id, workOrder: 'WO-BAD', reason: 'scheduled' } })
    const bad = await api(`/api/worksheets/${created.body.id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'conditions', gasTemperature: { value: 'warm', unit: 'C' }, temperatureMethod: 'ambient-shade', minutesSinceOperated: 5, ambient: { elevation: { value: 0, unit: 'm' } } } })
    expect(bad.status).toBe(400)
    expect(bad.body.data.issues[0].field).toBe('gasTemperature.value')
    const unknownStep = await api(`/api/worksheets/${created.body.id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'teleport' } })
    expect(unknownStep.status).toBe(400)
    expect(unknownStep.body.data.issues[0].field).toBe('step')
    expect((await api(`/api/worksheets/${created.body.id}`, { cookie: cookies.technician })).body.content.conditions).toBeUndefined()
  })

  it('an empty body from a technician is 400; from an inspector 403; without a session 401', async () => {
    expect((await api('/api/worksheets', { cookie: cookies.technician, body: {} })).status).toBe(400)
    expect((await api('/api/worksheets', { cookie: cookies.inspector, body: {} })).status).toBe(403)
    expect((await api('/api/worksheets', { body: {} })).status).toBe(401)
  })

  it('waits for the settle time after a charge before taking the as-left', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMC', /Main hydraulic/)
    const flow = await fillWorksheet(cookies.technician!, unit.id, { action: 'charge', asFoundOffset: -80 })
    expect(flow.afterAsFound.results.asFound.assessment.verdict).toBe('low')
    const early = await api(`/api/worksheets/${flow.id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE } })
    expect(early.status).toBe(409)
    expect(early.body.message).toMatch(/settle[\s\S]*15 min/)
    expect((await api(`/api/worksheets/${flow.id}`, { cookie: cookies.technician })).body.settleUntil).toBeTruthy()
  })

  it('cannot sign an as-left outside limits as serviceable without a defect or deferral reference', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMJ', /System 1/)
    const flow = await fillWorksheet(cookies.technician!, unit.id, { asFoundOffset: 200 })
    await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: '' })
    const refused = await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })
    expect(refused.status).toBe(422)
    expect(refused.body.message).toMatch(/defect or deferral reference/)
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Unit high, vent valve seized.', unserviceableReference: 'DEF-2026-0417' })
    const signed = await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })
    expect(signed.status).toBe(200)
    expect(signed.body.serviceable).toBe(false)
  })
})

describe('signing, countersign and the permanent record', () => {
  // Each test makes the worksheet it needs: none depends on another having run.
  /** A worksheet filled in and signed by the technician (awaiting countersign). */
  async function signedWorksheet(): Promise<number> {
    const unit = await unitAt(cookies.technician!, 'QX-FMK', /Normal brake/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    expect((await finishAndSign(cookies.technician!, flow)).status).toBe(200)
    return flow.id
  }
  /** The same, countersigned by the inspector (released). */
  async function releasedWorksheet(): Promise<number> {
    const id = await signedWorksheet()
    const released = await api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: { password: DEMO_PASSWORD, certify: true } })
    expect(released.body.state).toBe('released')
    return id
  }

  it('the performer signs with their password; inspectors are e-mailed', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMK', /Normal brake/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    const wrong = await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { password: 'not-mine', certify: true } })
    expect(wrong.status).toBe(401)
    const noIntent = await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD } })
    expect(noIntent.status).toBe(400)
    expect(noIntent.body.data.issues[0].field).toBe('certify')
    const signed = await finishAndSign(cookies.technician!, flow)
    expect(signed.status).toBe(200)
    expect(signed.body.state).toBe('awaiting-countersign')
    expect(signed.body.signatures[0]).toMatchObject({ capacity: 'performer', name: 'Rowan Hale', authorisationNumber: 'FMR-T-0412' })
    // Mail goes out from the outbox in the background: wait for it to arrive.
    await expect.poll(async () => (await inbox()).received.find(message => message.to.includes(DEMO.inspector) && message.subject.startsWith(`Worksheet ${flow.id} awaits countersign`))?.text).toContain('awaits independent inspection')
    const mail = await inbox()
    expect(mail.received.some(message => message.to.includes(DEMO.technician) && message.subject.includes(`Worksheet ${flow.id} `))).toBe(false)
  })

  it('no write after signing: 409 with the reason', async () => {
    const worksheetId = await signedWorksheet()
    const answer = await api(`/api/worksheets/${worksheetId}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'action', kind: 'vent' } })
    expect(answer.status).toBe(409)
    expect(answer.body.message).toMatch(/signed and can no longer change/)
    expect((await api(`/api/worksheets/${worksheetId}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(409)
  })

  it('a technician cannot countersign; another technician cannot edit', async () => {
    const worksheetId = await signedWorksheet()
    expect((await api(`/api/worksheets/${worksheetId}/countersign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(403)
  })

  it('the inspector returns it with a reason; the performer is e-mailed, corrects and signs again', async () => {
    const worksheetId = await signedWorksheet()
    const returned = await api(`/api/worksheets/${worksheetId}/return`, { cookie: cookies.inspector, body: { reason: 'Gas temperature taken in the sun; retake in shade.' } })
    expect(returned.status).toBe(200)
    expect(returned.body).toMatchObject({ state: 'returned', returnReason: 'Gas temperature taken in the sun; retake in shade.' })
    await expect.poll(async () => (await inbox()).received.some(message => message.to.includes(DEMO.technician) && message.subject.startsWith(`Worksheet ${worksheetId} returned`) && message.text.includes('retake in shade'))).toBe(true)
    const corrected = await api(`/api/worksheets/${worksheetId}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Temperature retaken in shade.' } })
    expect(corrected.status).toBe(200)
    const again = await api(`/api/worksheets/${worksheetId}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })
    expect(again.body.state).toBe('awaiting-countersign')
    expect(again.body.signatures.filter((signature: { capacity: string }) => signature.capacity === 'performer')).toHaveLength(2)
  })

  it('the inspector countersigns with their password: released, and the PDF holds the readings', async () => {
    const worksheetId = await signedWorksheet()
    const released = await api(`/api/worksheets/${worksheetId}/countersign`, { cookie: cookies.inspector, body: { password: DEMO_PASSWORD, certify: true } })
    expect(released.status).toBe(200)
    expect(released.body.state).toBe('released')
    expect(released.body.signatures.at(-1)).toMatchObject({ capacity: 'inspector', name: 'Imke Dorsey' })

    const response = await fetch(`${baseURL()}/api/worksheets/${worksheetId}/pdf`, { headers: { cookie: cookies.engineer! } })
    expect(response.headers.get('content-type')).toBe('application/pdf')
    const folder = mkdtempSync(join(tmpdir(), 'chargewell-pdf-'))
    writeFileSync(join(folder, 'record.pdf'), Buffer.from(await response.arrayBuffer()))
    const text = execFileSync('pdftotext', ['-layout', join(folder, 'record.pdf'), '-'], { encoding: 'utf8' })
    expect(text).toContain(`Worksheet ${worksheetId}`)
    expect(text).toContain('State: Released')
    expect(text).toContain('FJ-3340-02 rev B')
    expect(text).toMatch(/As-found: \d+\.\d psig at 15\.0 °C — IN LIMITS/)
    expect(text).toContain(`Engine: version ${released.body.engineVersion}`)
    expect(text).toContain('GA-0141')
    expect(text).toContain('Independent inspection by Imke Dorsey')
    expect(text).toContain('never oxygen or shop air')
  })

  it('an inspector cannot countersign their own work, even holding both roles', async () => {
    const unit = await unitAt(cookies.lead!, 'QX-FML', /Normal brake/)
    const flow = await fillWorksheet(cookies.lead!, unit.id)
    expect((await finishAndSign(cookies.lead!, flow)).status).toBe(200)
    const own = await api(`/api/worksheets/${flow.id}/countersign`, { cookie: cookies.lead, body: { password: DEMO_PASSWORD, certify: true } })
    expect(own.status).toBe(403)
    expect(own.body.message).toMatch(/Independent inspection/)
    expect((await api(`/api/worksheets/${flow.id}/return`, { cookie: cookies.lead, body: { reason: 'Returning my own work' } })).status).toBe(403)
    expect((await api(`/api/worksheets/${flow.id}/countersign`, { cookie: cookies.inspector, body: { password: DEMO_PASSWORD, certify: true } })).body.state).toBe('released')
  })

  it('a correction is a new worksheet that points at the released one, and both show the link', async () => {
    const worksheetId = await releasedWorksheet()
    const original = (await api(`/api/worksheets/${worksheetId}`, { cookie: cookies.technician })).body
    const correction = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: original.content.accumulator.id, workOrder: 'WO-CORRECTION', reason: 'scheduled', correctsId: worksheetId } })
    expect(correction.status).toBe(201)
    expect(correction.body.correctsId).toBe(worksheetId)
    expect((await api(`/api/worksheets/${worksheetId}`, { cookie: cookies.technician })).body.correctedBy).toContain(correction.body.id)
    const draft = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: original.content.accumulator.id, workOrder: 'WO-X', reason: 'scheduled', correctsId: correction.body.id } })
    expect(draft.status).toBe(409)
  })

  it('voiding keeps the record visible, with the reason; a technician cannot void; a released record is never voided', async () => {
    const worksheetId = await releasedWorksheet()
    const released = await api(`/api/worksheets/${worksheetId}/void`, { cookie: cookies.admin, body: { reason: 'Entered on the wrong aircraft.' } })
    expect(released.status).toBe(409)
    expect(released.body.message).toMatch(/A released record is never voided: a technician records a correction/)
    const unit = (await api(`/api/worksheets/${worksheetId}`, { cookie: cookies.technician })).body.content.accumulator.id
    const flow = await fillWorksheet(cookies.technician!, unit)
    expect((await api(`/api/worksheets/${flow.id}/void`, { cookie: cookies.technician, body: { reason: 'Entered on the wrong aircraft.' } })).status).toBe(403)
    const voided = await api(`/api/worksheets/${flow.id}/void`, { cookie: cookies.admin, body: { reason: 'Entered on the wrong aircraft.' } })
    expect(voided.body).toMatchObject({ state: 'voided', voidReason: 'Entered on the wrong aircraft.' })
    expect((await api(`/api/worksheets/${flow.id}`, { cookie: cookies.engineer })).body.state).toBe('voided')
    const list = await api('/api/worksheets?state=voided', { cookie: cookies.engineer })
    expect(list.body.items.map((item: { id: number }) => item.id)).toContain(flow.id)
    expect((await api(`/api/worksheets/${flow.id}/void`, { cookie: cookies.inspector, body: { reason: 'Again, for luck.' } })).status).toBe(409)
  })

  it('every state change is in the audit chain, which verifies', async () => {
    const report = await api('/api/audit/verify', { cookie: cookies.admin })
    expect(report.body.ok).toBe(true)
    expect(report.body.checked).toBeGreaterThan(120)
    expect((await api('/api/audit/verify', { cookie: cookies.inspector })).status).toBe(403)
  })
})

describe('attachments', () => {
  const png = Uint8Array.from([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A, 0, 0, 0, 13])

  it('takes a photo by its content, refuses a text file named .png, and serves files only to signed-in users', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMA', /Emergency/)
    const created = await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: unit.id, workOrder: 'WO-PHOTO', reason: 'scheduled' } })
    const stored = await upload('/api/attachments', { worksheetId: String(created.body.id), kind: 'gauge-photo' }, { name: 'gauge.png', bytes: png }, cookies.technician)
    expect(stored.status).toBe(201)
    expect(stored.body.mimeType).toBe('image/png')
    const fake = await upload('/api/attachments', { worksheetId: String(created.body.id), kind: 'gauge-photo' }, { name: 'gauge.png', bytes: new TextEncoder().encode('#!/bin/sh\necho hi') }, cookies.technician)
    expect(fake.status).toBe(415)
    expect((await upload('/api/attachments', { worksheetId: String(created.body.id), kind: 'gauge-photo' }, { name: 'gauge.png', bytes: png }, cookies.inspector)).status).toBe(403)
    expect((await api(`/api/attachments/${stored.body.id}`)).status).toBe(401)
    const served = await fetch(`${baseURL()}/api/attachments/${stored.body.id}`, { headers: { cookie: cookies.inspector! } })
    expect(served.headers.get('content-type')).toBe('image/png')
    expect(new Uint8Array(await served.arrayBuffer())).toEqual(png)
    expect((await api(`/api/worksheets/${created.body.id}`, { cookie: cookies.technician })).body.attachments).toHaveLength(1)
  })
})

describe('lists', () => {
  it('filters, sorts and pages the worksheets, and exports the same as CSV', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMC', /Normal brake/)
    const page = await api(`/api/worksheets?accumulatorId=${unit.id}&state=released&sort=performedAt&direction=asc&pageSize=2`, { cookie: cookies.engineer })
    expect(page.body.total).toBeGreaterThanOrEqual(5)
    expect(page.body.items).toHaveLength(2)
    expect(Date.parse(page.body.items[0].performedAt)).toBeLessThan(Date.parse(page.body.items[1].performedAt))
    const csv = await fetch(`${baseURL()}/api/worksheets/export?accumulatorId=${unit.id}&state=released`, { headers: { cookie: cookies.engineer! } })
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    const lines = (await csv.text()).trim().split(/\r?\n/)
    expect(lines[0]).toMatch(/^Worksheet,State,Work order,Registration/)
    expect(lines).toHaveLength(page.body.total + 1)
    expect((await api('/api/worksheets?from=yesterday', { cookie: cookies.engineer })).body.data.issues[0].field).toBe('from')
  })
})
