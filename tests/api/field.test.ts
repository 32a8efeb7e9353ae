/**
 * Work with no signal, from the server's side: the reference data a device keeps, and a worksheet
 * sent whole when the connection returns — started once however often (or however many times at
 * once) it is sent, every step replayed at the device's time and recomputed, what could not be
 * accepted reported in words and kept on the record, and signing held until the technician has
 * read it.
 */
import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { statusCounts } from '../support/counting'
import { AMBIENT, targetForReadings, GAS_TEMPERATURE, toolId, unitAt } from '../support/worksheet-flow'
import {
  applyReferenceUpdate, digestQuery, referenceDigests, UNIT_BUCKETS, type FieldReferenceUpdate,
} from '../../shared/utils/field-reference-delta'
import type { FieldReference } from '../../shared/types/field'
import type { WorksheetObservation } from '../../shared/types/worksheet'

const cookies = {} as Record<keyof typeof DEMO, string>
beforeAll(async () => {
  for (const [name, email] of Object.entries(DEMO)) cookies[name as keyof typeof DEMO] = await signIn(email)
})

const minutesAgo = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString()

/** A worksheet as a device sends it: every step with the time it was taken, no figure worked out. */
async function offlineWorksheet(registration: string, position: RegExp, gauge = 'GA-0141') {
  const unit = await unitAt(cookies.technician, registration, position)
  const reference = (await api('/api/field/reference', { cookie: cookies.technician })).body
  const installed = reference.units.find((item: { id: number }) => item.id === unit.id)
  const specification = reference.specifications.find(
    (item: { partNumber: string }) => item.partNumber === installed.partNumber,
  )
  const target = targetForReadings(specification).target
  const reading = { value: Math.round(target.value), unit: target.unit, basis: target.basis }
  return {
    unit,
    specification,
    target,
    body: {
      clientId: randomUUID(),
      accumulatorId: unit.id,
      specificationId: specification.id as number,
      workOrder: `WO-DEVICE-${Date.now()}`,
      reason: 'scheduled',
      startedAt: minutesAgo(50),
      steps: [
        {
          at: minutesAgo(49),
          body: { step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true },
        },
        {
          at: minutesAgo(47),
          body: { step: 'tools', gaugeId: await toolId(cookies.technician, gauge), cartId: await toolId(cookies.technician, 'NC-07') },
        },
        {
          at: minutesAgo(45),
          body: { step: 'conditions', gasTemperature: GAS_TEMPERATURE, temperatureMethod: 'ambient-shade', minutesSinceOperated: 90, ambient: AMBIENT },
        },
        { at: minutesAgo(40), body: { step: 'asFound', reading } },
        { at: minutesAgo(38), body: { step: 'action', kind: 'none' } },
        { at: minutesAgo(35), body: { step: 'asLeft', reading, gasTemperature: GAS_TEMPERATURE } },
        { at: minutesAgo(30), body: { step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Filled on the ramp.' } },
      ] as { at: string, body: Record<string, unknown> }[],
    },
  }
}

describe('the reference data a device keeps', () => {
  it('a technician gets their station\'s installed units, the current specification of each, and the tools in service', async () => {
    const answer = await api('/api/field/reference', { cookie: cookies.technician })
    expect(answer.status).toBe(200)
    const reference = answer.body
    expect(reference.station).toBe('Harlow Moor')
    expect(reference.units.length).toBeGreaterThan(0)
    const bases = new Set(reference.units.map((unit: { aircraft: { base: string } }) => unit.aircraft.base))
    expect([...bases]).toEqual(['Harlow Moor'])
    const partNumbers = new Set(reference.units.map((unit: { partNumber: string }) => unit.partNumber))
    const specified = new Set(reference.specifications.map((item: { partNumber: string }) => item.partNumber))
    expect(specified).toEqual(partNumbers)
    expect(reference.specifications.every((item: { status: string }) => item.status === 'current')).toBe(true)
    expect(reference.tools.some((tool: { assetNumber: string }) => tool.assetNumber === 'GA-0141')).toBe(true)
    expect(reference.timeZone).toBeTruthy()
  })

  it('is refreshed by what changed: nothing when nothing did, one bucket for one unit, the copy then equal to a fresh one', async () => {
    const full = async () => (await api<FieldReference>('/api/field/reference', { cookie: cookies.technician })).body
    const since = async (held: FieldReference) => {
      const answer = await api<FieldReferenceUpdate>(
        `/api/field/reference?${new URLSearchParams(digestQuery(referenceDigests(held)))}`,
        { cookie: cookies.technician },
      )
      expect(answer.status).toBe(200)
      return answer.body
    }
    const held = await full()
    const unchanged = await since(held)
    expect(unchanged.unitBuckets).toEqual({})
    expect(unchanged.specifications).toBeUndefined()
    expect(unchanged.tools).toBeUndefined()
    expect(JSON.stringify(unchanged).length).toBeLessThan(JSON.stringify(held).length / 5)

    // One unit changes (its system is renamed by an admin): only its bucket comes back.
    const unit = held.units[0]!
    const renamed = await api(`/api/accumulators/${unit.id}`, {
      method: 'PATCH', cookie: cookies.admin, body: { system: `${unit.system ?? 'System'} (renamed)` },
    })
    expect(renamed.status).toBe(200)
    const update = await since(held)
    expect(Object.keys(update.unitBuckets)).toEqual([String(unit.id % UNIT_BUCKETS)])
    expect(update.specifications).toBeUndefined()
    const refreshed = applyReferenceUpdate(held, update)
    const fresh = await full()
    // The same content; the device lists the units in its own order (registration, then position).
    const comparable = (reference: FieldReference) =>
      ({ ...reference, fetchedAt: '', units: [...reference.units].sort((a, b) => a.id - b.id) })
    expect(comparable(refreshed)).toEqual(comparable(fresh))
    expect(refreshed.units.find(item => item.id === unit.id)!.system).toMatch(/renamed/)
    // Put back, for the tests that follow.
    await api(`/api/accumulators/${unit.id}`, { method: 'PATCH', cookie: cookies.admin, body: { system: unit.system } })
  })

  it('refuses digests that are not all there', async () => {
    const answer = await api('/api/field/reference?units=abc&specifications=x&tools=y', { cookie: cookies.technician })
    expect(answer.status).toBe(400)
    expect(answer.body.data.issues[0].field).toBe('units')
    expect((await api('/api/field/reference?tools=y', { cookie: cookies.technician })).status).toBe(400)
  })

  it('is only for those who perform work; unknown parameters are refused', async () => {
    expect((await api('/api/field/reference', { cookie: cookies.inspector })).status).toBe(403)
    expect((await api('/api/field/reference', { cookie: cookies.engineer })).status).toBe(403)
    expect((await api('/api/field/reference')).status).toBe(401)
    expect((await api('/api/field/reference?station=elsewhere', { cookie: cookies.technician })).status).toBe(400)
  })
})

describe('a worksheet sent from a device', () => {
  it('is started once, every step replayed and every figure recomputed by the server, then signed as any other', async () => {
    const { body, target } = await offlineWorksheet('QX-FMA', /Normal brake/)
    const answer = await api('/api/worksheets/sync', { cookie: cookies.technician, body })
    expect(answer.status).toBe(201)
    expect(answer.body.created).toBe(true)
    expect(answer.body.conflicts).toEqual([])
    const record = answer.body.worksheet
    expect(record.state).toBe('draft')
    expect(record.content.offline).toMatchObject({ clientId: body.clientId, startedAt: body.startedAt, conflicts: [] })
    // The server's own figures: the target the engine gives, not anything the device said.
    expect(record.results.asFound.target.value).toBeCloseTo(target.value, 6)
    expect(record.results.asFound.engineVersion).toBeTruthy()
    expect(record.results.asLeft.assessment.verdict).toBeTruthy()
    // Each step carries the time the device took it.
    expect(record.content.finish.recordedAt).toBe(body.steps[6]!.at)
    expect(record.content.asFound.recordedAt).toBe(body.steps[3]!.at)
    const signed = await api(`/api/worksheets/${record.id}/sign`, {
      cookie: cookies.technician,
      body: { password: DEMO_PASSWORD, certify: true },
    })
    expect(signed.status).toBe(200)
    const events = (await api('/api/audit/events?entity=worksheet&pageSize=200', { cookie: cookies.admin })).body
    expect(JSON.stringify(events)).toMatch(new RegExp(`sent worksheet ${record.id} from a device with no signal`))
  })

  it('sent again (a lost answer, a second tab) gives the same worksheet; sent twelve times at once, one worksheet', async () => {
    const { body } = await offlineWorksheet('QX-FMJ', /System 1/)
    const first = await api('/api/worksheets/sync', { cookie: cookies.technician, body })
    const again = await api('/api/worksheets/sync', { cookie: cookies.technician, body })
    expect(first.status).toBe(201)
    expect(again.status).toBe(200)
    expect(again.body.created).toBe(false)
    expect(again.body.worksheet.id).toBe(first.body.worksheet.id)

    const racing = { ...body, clientId: randomUUID(), workOrder: `${body.workOrder}-R` }
    const answers = await Promise.all(
      Array.from({ length: 12 }, () => api('/api/worksheets/sync', { cookie: cookies.technician, body: racing })),
    )
    expect(statusCounts(answers)).toEqual({ 200: 11, 201: 1 })
    expect(new Set(answers.map(item => item.body.worksheet.id)).size).toBe(1)
    const listed = (await api(`/api/worksheets?q=${racing.workOrder}`, { cookie: cookies.technician })).body
    expect(listed.items).toHaveLength(1)
    // Another technician's device cannot claim the same id.
    const lead = await api('/api/worksheets/sync', { cookie: cookies.lead, body: racing })
    expect(lead.status).toBe(409)
  })

  it('reports a revised specification and a lapsed gauge in words, keeps them on the record, and holds signing until read', async () => {
    const { body, unit } = await offlineWorksheet('QX-FMB', /Normal brake/, 'GA-0098')
    // The device held revision A of the brake accumulator's specification.
    const superseded = (await api('/api/specifications?status=superseded&pageSize=100', { cookie: cookies.engineer })).body
      .items as { id: number, partNumber: string, revision: string }[]
    body.specificationId = superseded.find(item => item.partNumber === 'FA-2240-01')!.id
    const answer = await api('/api/worksheets/sync', { cookie: cookies.technician, body })
    expect(answer.status).toBe(201)
    const conflicts = answer.body.conflicts as string[]
    expect(conflicts).toHaveLength(2)
    expect(conflicts[0]).toMatch(/revised since the device loaded it \(rev A → rev /)
    expect(conflicts[1]).toMatch(/^Tools was not accepted: Gauge GA-0098: calibration expired[\s\S]*kept on the record as observed[\s\S]*Redo those steps: Tools, As-found, Action, Settle and as-left, Finish\.$/)
    const record = answer.body.worksheet
    expect(record.content.accumulator.id).toBe(unit.id)
    expect(record.content.offline.conflicts).toEqual(conflicts)
    expect(record.content.preparation).toBeTruthy()
    expect(record.content.tools).toBeUndefined()
    expect(record.results.asFound).toBeUndefined()
    // The conditions stand on their own and count; nothing read after the refused gauge is dropped.
    expect(record.content.conditions).toMatchObject({ gasTemperature: GAS_TEMPERATURE, minutesSinceOperated: 90 })
    const observations = record.content.observations as WorksheetObservation[]
    expect(observations.map(observation => observation.step)).toEqual(['tools', 'asFound', 'action', 'asLeft', 'finish'])
    const asFound = observations[1]!
    const sentAsFound = body.steps.find(step => step.body.step === 'asFound')!
    expect(asFound.values).toEqual({ reading: sentAsFound.body.reading })
    expect(asFound.takenAt).toBe(new Date(sentAsFound.at).toISOString())
    expect(asFound.gauge?.assetNumber).toBe('GA-0098')
    expect(asFound.reason).toMatch(/^Taken after the Tools step was refused, and it cannot count without that step\. Gauge GA-0098: calibration expired/)
    expect(observations[0]!.reason).toMatch(/^Gauge GA-0098: calibration expired/)

    // The steps are done again online; signing waits for the technician to say they read what changed.
    const step = (stepBody: object) =>
      api(`/api/worksheets/${record.id}`, { method: 'PATCH', cookie: cookies.technician, body: stepBody })
    expect((await step({ ...body.steps[1]!.body, gaugeId: await toolId(cookies.technician, 'GA-0141') })).status).toBe(200)
    for (const later of body.steps.slice(2)) expect((await step(later.body)).status).toBe(200)
    const held = await api(`/api/worksheets/${record.id}/sign`, {
      cookie: cookies.technician,
      body: { password: DEMO_PASSWORD, certify: true },
    })
    expect(held.status).toBe(422)
    expect(JSON.stringify(held.body)).toMatch(/read what changed|review/i)
    expect((await step({ step: 'reviewSync', reviewed: false })).status).toBe(400)
    expect((await step({ step: 'reviewSync', reviewed: true })).status).toBe(200)
    const signed = await api(`/api/worksheets/${record.id}/sign`, {
      cookie: cookies.technician,
      body: { password: DEMO_PASSWORD, certify: true },
    })
    expect(signed.status).toBe(200)
  })

  it('a worksheet the device dated in the future or out of order comes back with the clock as a conflict, never clean', async () => {
    const { body } = await offlineWorksheet('QX-FMA', /Normal brake/)
    const future = structuredClone(body)
    future.steps[3]!.at = new Date(Date.now() + 3_600_000).toISOString()
    const answer = await api('/api/worksheets/sync', { cookie: cookies.technician, body: future })
    expect(answer.status).toBe(201)
    expect(answer.body.conflicts.join(' ')).toMatch(/The device's clock: step 4 \(As-found\) is dated .* later than the moment the server received it/)
    const backwards = structuredClone(body)
    backwards.clientId = randomUUID()
    backwards.steps[4]!.at = minutesAgo(120)
    const reviewed = await api('/api/worksheets/sync', { cookie: cookies.technician, body: backwards })
    expect(reviewed.status).toBe(201)
    expect(reviewed.body.conflicts.join(' ')).toMatch(/step 5 \(Action\) .* before the steps already recorded/)
    // Signing waits for the technician to say they have read it.
    const held = await api(`/api/worksheets/${reviewed.body.worksheet.id}/sign`, {
      cookie: cookies.technician,
      body: { password: DEMO_PASSWORD, certify: true },
    })
    expect(held.status).toBe(422)
  })

  it('says what it did with a send that differs: changed steps are a conflict, a reused device id is refused', async () => {
    const { body } = await offlineWorksheet('QX-FMA', /Normal brake/)
    const first = await api('/api/worksheets/sync', { cookie: cookies.technician, body })
    expect(first.status).toBe(201)
    // The device sends it again with a reading changed after the first send: not taken, and said so.
    const changed = structuredClone(body)
    const asFound = changed.steps[3]!.body as { reading: { value: number } }
    asFound.reading.value += 40
    const again = await api('/api/worksheets/sync', { cookie: cookies.technician, body: changed })
    expect(again.status).toBe(200)
    expect(again.body.created).toBe(false)
    expect(again.body.conflicts.join(' ')).toMatch(/changed its steps since: the changes were not taken/)
    expect(again.body.worksheet.content.asFound.reading.value).toBe(asFound.reading.value - 40)
    // The unchanged send is answered as before, with no new conflict.
    expect((await api('/api/worksheets/sync', { cookie: cookies.technician, body })).body.conflicts).toEqual(first.body.conflicts)
    // The same device id for another work order: refused in words, nothing dropped quietly.
    const reused = await api('/api/worksheets/sync', { cookie: cookies.technician, body: { ...body, workOrder: 'WO-ANOTHER-ONE' } })
    expect(reused.status).toBe(409)
    expect(reused.body.message).toMatch(/already belongs to worksheet \d+[\s\S]*stays on the device/)
  })

  it('answers bad input on its field, and is only for those who perform work', async () => {
    const { body } = await offlineWorksheet('QX-FMA', /Normal brake/)
    const notUuid = await api('/api/worksheets/sync', { cookie: cookies.technician, body: { ...body, clientId: 'abc' } })
    expect(notUuid.status).toBe(400)
    expect(JSON.stringify(notUuid.body)).toMatch(/clientId/)
    const badStep = structuredClone(body)
    badStep.steps[2]!.body.minutesSinceOperated = -5
    const refused = await api('/api/worksheets/sync', { cookie: cookies.technician, body: badStep })
    expect(refused.status).toBe(400)
    expect(JSON.stringify(refused.body)).toMatch(/steps\.2\.body\.minutesSinceOperated/)
    expect((await api('/api/worksheets/sync', { cookie: cookies.inspector, body })).status).toBe(403)
    expect((await api('/api/worksheets/sync', { cookie: cookies.engineer, body })).status).toBe(403)
    expect((await api('/api/worksheets/sync', { body })).status).toBe(401)
  })
})
