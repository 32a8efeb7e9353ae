/**
 * Server time is the record's time. A device's claimed time (`x-taken-at` on a step it kept with no
 * signal, the times of a worksheet filled offline) is kept as the device's claim, bounded by the
 * server's receipt, and can never make a refused step acceptable: not an expired gauge, not a settle
 * time that has not passed.
 */
import { execFileSync } from 'node:child_process'
import { randomUUID } from 'node:crypto'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { AMBIENT, targetForReadings, GAS_TEMPERATURE, toolId, unitAt } from '../support/worksheet-flow'

let technician: string
let admin: string
beforeAll(async () => {
  technician = await signIn(DEMO.technician)
  admin = await signIn(DEMO.admin)
})
const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString()
const hoursAgo = (hours: number) => minutesAgo(hours * 60)

async function started(registration = 'QX-FMA', position = /Normal brake/) {
  const unit = await unitAt(technician, registration, position)
  const created = await api('/api/worksheets', { cookie: technician, body: { accumulatorId: unit.id, workOrder: `WO-CLOCK-${Date.now()}`, reason: 'scheduled' } })
  expect(created.status).toBe(201)
  const id = created.body.id as number
  const step = (body: object, takenAt?: string) =>
    api(`/api/worksheets/${id}`, { method: 'PATCH', cookie: technician, body, headers: takenAt ? { 'x-taken-at': takenAt } : {} })
  return { id, created: created.body, step }
}

describe('a step sent online with the device\'s time', () => {
  it('an expired gauge dated back to before its expiry is refused: not counted, kept as observed', async () => {
    const { id, step } = await started()
    expect((await step({ step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true })).status).toBe(200)
    const expired = { step: 'tools', gaugeId: await toolId(technician, 'GA-0098'), cartId: await toolId(technician, 'NC-07') }
    expect((await step(expired)).status).toBe(422)
    const backdated = await step(expired, '2026-11-01T08:00:00Z')
    expect(backdated.status).toBe(422)
    expect(backdated.body.message).toMatch(/more than 72 hours before the server received it[\s\S]*It was not counted/)
    expect(backdated.body.data.keptAsObservation).toBe(true)
    // Within the span but before the worksheet was started on the server: refused the same way.
    const beforeStart = await step(expired, minutesAgo(30))
    expect(beforeStart.status).toBe(422)
    expect(beforeStart.body.message).toMatch(/before the worksheet was started/)
    expect(backdated.body.data.issues[0].field).toBe('x-taken-at')
    const record = (await api(`/api/worksheets/${id}`, { cookie: technician })).body
    expect(record.content.tools).toBeUndefined()
    // Not counted, and not lost either: both sends are on the record as observed, at the server's receipt with the
    // device's claim beside it.
    expect(record.content.observations.map((kept: { claimedAt: string }) => kept.claimedAt))
      .toEqual(['2026-11-01T08:00:00Z', expect.any(String)])
    expect(Date.parse(record.content.observations[0].takenAt)).toBeGreaterThan(Date.now() - 3_600_000)
  })

  it('dating the charge back does not shorten the settle time', async () => {
    const { created, step } = await started('QX-FMC', /Normal brake/)
    expect((await step({ step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true })).status).toBe(200)
    expect((await step({ step: 'tools', gaugeId: await toolId(technician, 'GA-0141'), cartId: await toolId(technician, 'NC-07') })).status).toBe(200)
    expect((await step({ step: 'conditions', gasTemperature: GAS_TEMPERATURE, temperatureMethod: 'ambient-shade', minutesSinceOperated: 90, ambient: AMBIENT })).status).toBe(200)
    const target = targetForReadings(created.content.specification).target
    const low = { value: Math.round(target.value) - 150, unit: target.unit, basis: target.basis }
    const right = { value: Math.round(target.value), unit: target.unit, basis: target.basis }
    expect((await step({ step: 'asFound', reading: low }, minutesAgo(30))).status).toBe(422)
    expect((await step({ step: 'asFound', reading: low })).status).toBe(200)
    expect((await step({ step: 'action', kind: 'charge' }, minutesAgo(30))).status).toBe(422)
    expect((await step({ step: 'action', kind: 'charge' })).status).toBe(200)
    // The as-left right after the charge: the settle time has not passed, whatever the device says.
    const early = await step({ step: 'asLeft', reading: right, gasTemperature: GAS_TEMPERATURE })
    expect(early.status).toBe(409)
    expect(early.body.message).toMatch(/more minute/)
    expect((await step({ step: 'asLeft', reading: right, gasTemperature: GAS_TEMPERATURE }, new Date(Date.now() + 3_600_000).toISOString())).status).toBe(422)
  })

  it('every step carries the server\'s receipt, and the device\'s claim beside it', async () => {
    const { id, step } = await started('QX-FMJ', /System 1/)
    const claim = new Date(Date.now() - 5_000).toISOString()
    expect((await step({ step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true }, claim)).status).toBe(200)
    const record = (await api(`/api/worksheets/${id}`, { cookie: technician })).body
    expect(record.content.timeline).toHaveLength(1)
    expect(record.content.timeline[0]).toMatchObject({ step: 'preparation', claimedAt: claim })
    expect(Date.parse(record.content.timeline[0].receivedAt)).toBeGreaterThanOrEqual(Date.parse(claim))
  })
})

describe('a step kept on a device and refused when it arrives', () => {
  it('is kept on the record as observed, with its time, the gauge in hand and why; refused online, nothing is kept', async () => {
    const { id, step } = await started('QX-FMB', /Normal brake/)
    expect((await step({ step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true })).status).toBe(200)
    const expired = { step: 'tools', gaugeId: await toolId(technician, 'GA-0098'), cartId: await toolId(technician, 'NC-07') }
    // Online, the technician sees the refusal at once and nothing is kept.
    expect((await step(expired)).status).toBe(422)
    expect((await api(`/api/worksheets/${id}`, { cookie: technician })).body.content.observations).toBeUndefined()
    // Kept on a device with no signal: the choice and the as-found read after it arrive later.
    const takenAt = new Date(Date.now() - 20_000).toISOString()
    const refused = await step(expired, takenAt)
    expect(refused.status).toBe(422)
    expect(refused.body.data.keptAsObservation).toBe(true)
    const reading = { value: 1390, unit: 'psi', basis: 'gauge' }
    const after = await step({ step: 'asFound', reading }, new Date(Date.now() - 10_000).toISOString())
    expect(after.status).toBe(409)
    expect(after.body.data.keptAsObservation).toBe(true)
    const record = (await api(`/api/worksheets/${id}`, { cookie: technician })).body
    expect(record.content.tools).toBeUndefined()
    expect(record.results.asFound).toBeUndefined()
    expect(record.content.observations).toEqual([
      expect.objectContaining({ step: 'tools', takenAt, claimedAt: takenAt, gauge: expect.objectContaining({ assetNumber: 'GA-0098' }), reason: expect.stringMatching(/^Gauge GA-0098: calibration expired/) }),
      expect.objectContaining({ step: 'asFound', values: { reading }, gauge: expect.objectContaining({ assetNumber: 'GA-0098' }), reason: 'Record the gauge and cart first.' }),
    ])
    const events = (await api('/api/audit/events?entity=worksheet&pageSize=200', { cookie: admin })).body
    expect(JSON.stringify(events)).toMatch(/kept the tools step of worksheet [^"]{0,80} as observed, not counted: Gauge GA-0098/)
  })
})

describe('a worksheet filled offline with a wrong or tampered clock', () => {
  async function offlineBody(startedAt: string, stepTimes: string[], gauge: string) {
    const unit = await unitAt(technician, 'QX-FMA', /Normal brake/)
    const reference = (await api('/api/field/reference', { cookie: technician })).body
    const installed = reference.units.find((item: { id: number }) => item.id === unit.id)
    const specification = reference.specifications.find(
      (item: { partNumber: string }) => item.partNumber === installed.partNumber,
    )
    return {
      clientId: randomUUID(),
      accumulatorId: unit.id,
      specificationId: specification.id as number,
      workOrder: `WO-CLOCK-${Date.now()}`,
      reason: 'scheduled',
      startedAt,
      steps: [
        { at: stepTimes[0]!, body: { step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true } },
        { at: stepTimes[1]!, body: { step: 'tools', gaugeId: await toolId(technician, gauge), cartId: await toolId(technician, 'NC-07') } },
      ],
    }
  }

  it('started in 2020 with an expired gauge: conflicts to review, the gauge refused, and it cannot be signed', async () => {
    const body = await offlineBody('2020-03-01T08:00:00Z', ['2020-03-01T08:05:00Z', '2020-03-01T08:10:00Z'], 'GA-0098')
    const answer = await api('/api/worksheets/sync', { cookie: technician, body })
    expect(answer.status).toBe(201)
    const conflicts = answer.body.conflicts.join(' ')
    expect(conflicts).toMatch(/the start is dated 1 Mar 2020, 08:00, which is more than 72 hours before the server received it/)
    expect(conflicts).toMatch(/Tools was not accepted: Gauge GA-0098/)
    expect(answer.body.worksheet.content.tools).toBeUndefined()
    const signed = await api(`/api/worksheets/${answer.body.worksheet.id}/sign`, { cookie: technician, body: { password: DEMO_PASSWORD, certify: true } })
    expect(signed.status).toBe(422)
  })

  it('a gauge in calibration when the device says it was used, expired when the server receives it: judged at receipt', async () => {
    const gaugeId = await toolId(admin, 'GA-0152')
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10)
    expect((await api(`/api/tools/${gaugeId}`, { method: 'PATCH', cookie: admin, body: { calibrationDue: yesterday } })).status).toBe(200)
    const body = await offlineBody(hoursAgo(50), [hoursAgo(49.9), hoursAgo(49.8)], 'GA-0152')
    const answer = await api('/api/worksheets/sync', { cookie: technician, body })
    expect(answer.status).toBe(201)
    expect(answer.body.conflicts.join(' ')).toMatch(/Tools was not accepted: Gauge GA-0152: calibration expired/)
    expect(answer.body.worksheet.content.timeline[0]).toMatchObject({ step: 'preparation', claimedAt: body.steps[0]!.at })
    // The refused choice stays on the record as observed, with the device's time for it.
    expect(answer.body.worksheet.content.observations).toEqual([
      expect.objectContaining({ step: 'tools', claimedAt: body.steps[1]!.at, gauge: expect.objectContaining({ assetNumber: 'GA-0152' }) }),
    ])
  })
})

describe('the record says which times rest on a device\'s clock', () => {
  it('a worksheet filled offline, signed and countersigned: its PDF shows each step\'s device time beside the server\'s receipt', async () => {
    // A unit of the technician's station, which the device's copy holds.
    const unit = await unitAt(technician, 'QX-FMA', /Normal brake/)
    const reference = (await api('/api/field/reference', { cookie: technician })).body
    const installed = reference.units.find((item: { id: number }) => item.id === unit.id)
    const specification = reference.specifications.find(
      (item: { partNumber: string }) => item.partNumber === installed.partNumber,
    )
    const target = targetForReadings(specification).target
    const reading = { value: Math.round(target.value), unit: target.unit, basis: target.basis }
    const body = {
      clientId: randomUUID(),
      accumulatorId: unit.id,
      specificationId: specification.id as number,
      workOrder: `WO-CLOCK-PDF-${Date.now()}`,
      reason: 'scheduled',
      startedAt: minutesAgo(50),
      steps: [
        { at: minutesAgo(49), body: { step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true } },
        { at: minutesAgo(47), body: { step: 'tools', gaugeId: await toolId(technician, 'GA-0141'), cartId: await toolId(technician, 'NC-07') } },
        { at: minutesAgo(45), body: { step: 'conditions', gasTemperature: GAS_TEMPERATURE, temperatureMethod: 'ambient-shade', minutesSinceOperated: 90, ambient: AMBIENT } },
        { at: minutesAgo(40), body: { step: 'asFound', reading } },
        { at: minutesAgo(38), body: { step: 'action', kind: 'none' } },
        { at: minutesAgo(35), body: { step: 'asLeft', reading, gasTemperature: GAS_TEMPERATURE } },
        { at: minutesAgo(30), body: { step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Filled on the ramp.' } },
      ],
    }
    const synced = await api('/api/worksheets/sync', { cookie: technician, body })
    expect(synced.status).toBe(201)
    expect(synced.body.conflicts).toEqual([])
    const id = synced.body.worksheet.id as number
    expect((await api(`/api/worksheets/${id}/sign`, { cookie: technician, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(200)
    const inspector = await signIn(DEMO.inspector)
    expect((await api(`/api/worksheets/${id}/countersign`, { cookie: inspector, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(200)
    const response = await fetch(`${baseURL()}/api/worksheets/${id}/pdf`, { headers: { cookie: inspector } })
    expect(response.status).toBe(200)
    const folder = mkdtempSync(join(tmpdir(), 'chargewell-pdf-'))
    writeFileSync(join(folder, 'record.pdf'), Buffer.from(await response.arrayBuffer()))
    const text = execFileSync('pdftotext', ['-layout', join(folder, 'record.pdf'), '-'], { encoding: 'utf8' })
    expect(text).toContain('Times kept on a device')
    expect(text).toMatch(/As-found: taken on the device .* \(its clock\); received/)
  })
})
