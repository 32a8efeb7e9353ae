/**
 * Two people (or two tabs) pressing at once. Every state change is a compare-and-set: whatever
 * the interleaving, exactly one request wins, the losers get 409 with a plain reason, and the
 * record ends in one state consistent with its signatures. Concurrent writers wait their turn:
 * no 5xx from contention.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { statusCounts } from '../support/counting'
import { fillWorksheet, finishAndSign, unitAt } from '../support/worksheet-flow'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
})

const signature = { password: DEMO_PASSWORD, certify: true }

async function worksheet(id: number) {
  return (await api(`/api/worksheets/${id}`, { cookie: cookies.engineer })).body
}

/** The record's state agrees with its signatures and reasons. */
function expectConsistent(record: Awaited<ReturnType<typeof worksheet>>) {
  const inRound = (capacity: string) =>
    record.signatures.filter(
      (item: { capacity: string, round: number }) => item.capacity === capacity && item.round === record.round,
    ).length
  const all = (capacity: string) =>
    record.signatures.filter((item: { capacity: string }) => item.capacity === capacity).length
  // Never two signatures of one kind in one round.
  for (const round of new Set<number>(record.signatures.map((item: { round: number }) => item.round))) {
    for (const capacity of ['performer', 'inspector']) {
      expect(
        record.signatures.filter(
          (item: { capacity: string, round: number }) => item.capacity === capacity && item.round === round,
        ).length,
      ).toBeLessThanOrEqual(1)
    }
  }
  switch (record.state) {
    case 'awaiting-countersign':
      expect([inRound('performer'), inRound('inspector'), record.returnReason, record.voidReason]).toEqual([
        1,
        0,
        null,
        null,
      ])
      break
    case 'released':
      expect([inRound('performer'), inRound('inspector'), record.returnReason, record.voidReason]).toEqual([
        1,
        1,
        null,
        null,
      ])
      expect(record.releasedAt).not.toBeNull()
      break
    case 'returned':
      expect(inRound('performer')).toBe(0)
      expect(all('inspector')).toBe(0)
      expect(record.returnReason).toBeTruthy()
      expect(record.voidReason).toBeNull()
      break
    case 'voided':
      expect(record.voidReason).toBeTruthy()
      break
  }
}

/** A fresh worksheet signed by the technician and awaiting countersign. */
async function awaitingCountersign(registration = 'QX-FMA', position = /Main hydraulic/) {
  const unit = await unitAt(cookies.technician!, registration, position)
  const flow = await fillWorksheet(cookies.technician!, unit.id)
  const signed = await finishAndSign(cookies.technician!, flow)
  expect(signed.status).toBe(200)
  return signed.body as { id: number, version: number }
}

describe('the seeded countersign queue', () => {
  it('holds at least three worksheets signed by the technician and awaiting countersign', async () => {
    const queue = await api('/api/worksheets?state=awaiting-countersign&pageSize=50', { cookie: cookies.inspector })
    const byTechnician = queue.body.items.filter((item: { performer: string }) => item.performer === 'Rowan Hale')
    expect(byTechnician.length).toBeGreaterThanOrEqual(3)
    for (const item of byTechnician) expectConsistent(await worksheet(item.id))
  })
})

describe('parallel presses on one record', () => {
  it('50 countersigns at once: exactly one 200, 49 × 409, one inspector signature', async () => {
    const queue = await api('/api/worksheets?state=awaiting-countersign&pageSize=50', { cookie: cookies.inspector })
    const target = queue.body.items.find((item: { performer: string }) => item.performer === 'Rowan Hale')
    const answers = await Promise.all(
      Array.from({ length: 50 }, () =>
        api(`/api/worksheets/${target.id}/countersign`, { cookie: cookies.inspector, body: signature }),
      ),
    )
    expect(statusCounts(answers)).toEqual({ 200: 1, 409: 49 })
    for (const loser of answers.filter(answer => answer.status === 409))
      expect(loser.body.message).toMatch(/changed|already|only a worksheet awaiting/i)
    const record = await worksheet(target.id)
    expect(record.state).toBe('released')
    expect(record.signatures.filter((item: { capacity: string }) => item.capacity === 'inspector')).toHaveLength(1)
    expectConsistent(record)
  })

  it('20 performer signs at once: exactly one 200, 19 × 409, one performer signature', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMB', /Main hydraulic/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: { value: 15, unit: 'C' } })
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: '' })
    const answers = await Promise.all(
      Array.from({ length: 20 }, () =>
        api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: signature }),
      ),
    )
    expect(statusCounts(answers)).toEqual({ 200: 1, 409: 19 })
    const record = await worksheet(flow.id)
    expect(record.state).toBe('awaiting-countersign')
    expect(record.signatures).toHaveLength(1)
    expectConsistent(record)
  })

  it.each(['return first', 'countersign first'])(
    'return racing countersign (%s): one wins, the record is consistent',
    async (order) => {
      for (let attempt = 0; attempt < 3; attempt++) {
        const { id } = await awaitingCountersign()
        const countersign = () =>
          api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: signature })
        const giveBack = () =>
          api(`/api/worksheets/${id}/return`, {
            cookie: cookies.lead,
            body: { reason: 'Re-read the as-found in the shade.' },
          })
        const answers
          = order === 'return first'
            ? await Promise.all([giveBack(), countersign()])
            : await Promise.all([countersign(), giveBack()])
        expect(statusCounts(answers)).toEqual({ 200: 1, 409: 1 })
        const record = await worksheet(id)
        expect(['released', 'returned']).toContain(record.state)
        expectConsistent(record)
      }
    },
  )

  it('void racing countersign, each acting on the version it saw: one wins, the record is consistent', async () => {
    for (let attempt = 0; attempt < 4; attempt++) {
      const { id, version } = await awaitingCountersign()
      const headers = { 'if-match': `"${version}"` }
      const answers = await Promise.all([
        api(`/api/worksheets/${id}/void`, {
          cookie: cookies.admin,
          body: { reason: 'Raised against the wrong unit.' },
          headers,
        }),
        api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: signature, headers }),
      ])
      expect(statusCounts(answers)).toEqual({ 200: 1, 409: 1 })
      const record = await worksheet(id)
      expectConsistent(record)
      if (record.state === 'voided')
        expect(record.signatures.filter((item: { capacity: string }) => item.capacity === 'inspector')).toHaveLength(0)
      else expect(record.state).toBe('released')
    }
  })

  it('refuses a change made on a version that is no longer current (If-Match), and a malformed one', async () => {
    const { id, version } = await awaitingCountersign()
    const stale = await api(`/api/worksheets/${id}/countersign`, {
      cookie: cookies.inspector,
      body: signature,
      headers: { 'if-match': `"${version - 1}"` },
    })
    expect(stale.status).toBe(409)
    expect(stale.body.message).toMatch(/has changed since you opened it/)
    const malformed = await api(`/api/worksheets/${id}/countersign`, {
      cookie: cookies.inspector,
      body: signature,
      headers: { 'if-match': 'yesterday' },
    })
    expect(malformed.status).toBe(400)
    const current = await api(`/api/worksheets/${id}`, { cookie: cookies.inspector })
    expect(current.headers.get('etag')).toBe(`"${version}"`)
    const fresh = await api(`/api/worksheets/${id}/countersign`, {
      cookie: cookies.inspector,
      body: signature,
      headers: { 'if-match': current.headers.get('etag')! },
    })
    expect(fresh.status).toBe(200)
    expect(fresh.body.version).toBe(version + 1)
  })

  it('a returned record is signed again in a new round, and countersigned once in it', async () => {
    const { id } = await awaitingCountersign()
    expect(
      (
        await api(`/api/worksheets/${id}/return`, {
          cookie: cookies.inspector,
          body: { reason: 'Photo of the gauge missing.' },
        })
      ).status,
    ).toBe(200)
    const signs = await Promise.all(
      Array.from({ length: 5 }, () =>
        api(`/api/worksheets/${id}/sign`, { cookie: cookies.technician, body: signature }),
      ),
    )
    expect(statusCounts(signs)).toEqual({ 200: 1, 409: 4 })
    const countersigns = await Promise.all(
      Array.from({ length: 5 }, () =>
        api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: signature }),
      ),
    )
    expect(statusCounts(countersigns)).toEqual({ 200: 1, 409: 4 })
    const record = await worksheet(id)
    expect(record.round).toBe(2)
    expect(
      record.signatures.map((item: { capacity: string, round: number }) => `${item.capacity}:${item.round}`),
    ).toEqual(['performer:1', 'performer:2', 'inspector:2'])
    expectConsistent(record)
  })
})

describe('writers at the same time wait instead of failing', () => {
  it('10 parallel step saves and 10 parallel record creations: no 5xx', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMJ', /System 1/)
    const created = await Promise.all(
      Array.from({ length: 10 }, (_, index) =>
        api('/api/worksheets', {
          cookie: cookies.technician,
          body: { accumulatorId: unit.id, workOrder: `WO-PAR-${index}`, reason: 'scheduled' },
        }),
      ),
    )
    expect(statusCounts(created)).toEqual({ 201: 10 })
    const ids = created.map(answer => answer.body.id as number)
    const acrossRecords = await Promise.all(
      ids.map(id =>
        api(`/api/worksheets/${id}`, {
          method: 'PATCH',
          cookie: cookies.technician,
          body: { step: 'preparation', systemDepressurised: true, aircraftSafe: true },
        }),
      ),
    )
    expect(statusCounts(acrossRecords)).toEqual({ 200: 10 })
    const oneRecord = await Promise.all(
      [
        'systemDepressurised',
        'aircraftSafe',
        'eyeProtection',
        'nitrogenOnly',
        'systemDepressurised',
        'aircraftSafe',
        'eyeProtection',
        'nitrogenOnly',
        'eyeProtection',
        'nitrogenOnly',
      ].map(check =>
        api(`/api/worksheets/${ids[0]}`, {
          method: 'PATCH',
          cookie: cookies.technician,
          body: { step: 'preparation', [check]: true },
        }),
      ),
    )
    expect(statusCounts(oneRecord)).toEqual({ 200: 10 })
    const record = await worksheet(ids[0]!)
    expect(Object.keys(record.content.preparation).sort()).toEqual([
      'aircraftSafe',
      'eyeProtection',
      'nitrogenOnly',
      'systemDepressurised',
    ])
  })

  it('a mix of 36 writes across the registers, preferences, studies and cycle checks: no 5xx', async () => {
    const aircraft = (await api('/api/aircraft?pageSize=5', { cookie: cookies.admin })).body.items
    const tools = (await api('/api/tools?pageSize=5', { cookie: cookies.admin })).body.items
    const unit = await unitAt(cookies.technician!, 'QX-FMJ', /System 1/)
    const writes = Array.from({ length: 6 }, (_, index) => [
      api('/api/aircraft', {
        cookie: cookies.admin,
        body: { registration: `QX-ZP${index}`, fleetNumber: `99${index}`, type: 'Tarnwing 46', base: 'Harlow Moor' },
      }),
      api(`/api/aircraft/${aircraft[index % aircraft.length].id}`, {
        method: 'PATCH',
        cookie: cookies.admin,
        body: { base: index % 2 ? 'Skelby' : 'Harlow Moor' },
      }),
      api(`/api/tools/${tools[index % tools.length].id}`, {
        method: 'PATCH',
        cookie: cookies.admin,
        body: { description: `Gauge, checked ${index}` },
      }),
      api('/api/me/preferences', {
        method: 'PATCH',
        cookie: cookies.engineer,
        body: {
          pressureUnit: 'bar',
          temperatureUnit: 'C',
          volumeUnit: 'L',
          stationElevation: { value: 120, unit: 'm' },
          stationName: index % 2 ? 'Skelby' : 'Harlow Moor',
        },
      }),
      api('/api/cycle-checks', {
        cookie: cookies.technician,
        body: {
          aircraftId: unit.aircraft.id,
          system: 'Hydraulic system 1',
          checkedAt: '2026-11-20',
          cutOut: { value: 3000, unit: 'psi', basis: 'gauge' },
          cutIn: { value: 2600, unit: 'psi', basis: 'gauge' },
          interval: { value: 400 + index, unit: 's' },
          fluidTemperature: { value: 40, unit: 'C' },
          ambient: { elevation: { value: 420, unit: 'ft' } },
        },
      }),
      api('/api/worksheets', {
        cookie: cookies.lead,
        body: { accumulatorId: unit.id, workOrder: `WO-MIX-${index}`, reason: 'defect' },
      }),
    ]).flat()
    const answers = await Promise.all(writes)
    expect(answers.filter(answer => answer.status >= 500).map(answer => answer.body)).toEqual([])
    expect(answers.every(answer => answer.status < 300)).toBe(true)
    const chain = await api('/api/audit/verify', { cookie: cookies.admin })
    expect(chain.body).toMatchObject({ ok: true, mismatches: 0, headProblems: [] })
  })
})
