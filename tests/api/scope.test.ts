/**
 * The scope matrix: two stations (Harlow Moor, Skelby) and two operators (Fellmoor Regional, Corran Isles
 * Airways, who own QX-FML at Skelby). Users granted part of the organisation see, search, export, print,
 * download and change only the records of the aircraft they may see, on every route that serves them;
 * everything else answers as if it were not there (404, or 422 naming the field). Users granted everything
 * and administrators see the whole organisation.
 */
import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, SCOPED_DEMO, signIn, upload } from '../support/api'
import { baseURL } from '../support/file-server'
import { fillWorksheet, unitAt } from '../support/worksheet-flow'

const ALL = ['QX-FMA', 'QX-FMB', 'QX-FMC', 'QX-FMJ', 'QX-FMK', 'QX-FML']

/** Who sees which aircraft, by the demo's grants. */
const MATRIX = {
  skelbyTechnician: { role: 'technician', sees: ['QX-FMC', 'QX-FMK', 'QX-FML'], stations: ['Skelby'] },
  corranInspector: { role: 'inspector', sees: ['QX-FML'], stations: ['Skelby'] },
  harlowEngineer: { role: 'engineer', sees: ['QX-FMA', 'QX-FMB', 'QX-FMJ'], stations: ['Harlow Moor'] },
  technician: { role: 'technician', sees: ALL, stations: ['Harlow Moor', 'Skelby'] },
  inspector: { role: 'inspector', sees: ALL, stations: ['Harlow Moor', 'Skelby'] },
  engineer: { role: 'engineer', sees: ALL, stations: ['Harlow Moor', 'Skelby'] },
  admin: { role: 'admin', sees: ALL, stations: ['Harlow Moor', 'Skelby'] },
} as const
type Who = keyof typeof MATRIX

const cookies = {} as Record<Who | 'lead', string>
const aircraftId: Record<string, number> = {}
const unitOn: Record<string, number> = {}
const systemOn: Record<string, string> = {}
const releasedOn: Record<string, number> = {}
const draftOn: Record<string, number> = {}
const photoOn: Record<string, number> = {}

// The smallest PNG signature and header that are recognised by content.
const png = new Uint8Array([
  0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52,
  0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0, 0, 0,
])

async function csv(path: string, cookie: string): Promise<string> {
  const response = await fetch(`${baseURL()}${path}`, { headers: { cookie } })
  expect(response.status, path).toBe(200)
  return response.text()
}

/** The demo registrations a text names. */
const named = (text: string) => ALL.filter(registration => text.includes(registration))

beforeAll(async () => {
  for (const [who, email] of Object.entries({ ...DEMO, ...SCOPED_DEMO })) {
    if (who in MATRIX || who === 'lead') cookies[who as Who] = await signIn(email)
  }
  const fleet = (await api('/api/aircraft?pageSize=100', { cookie: cookies.admin })).body.items as { id: number, registration: string }[]
  for (const aircraft of fleet) aircraftId[aircraft.registration] = aircraft.id
  for (const registration of ALL) {
    const unit = await unitAt(cookies.admin, registration, /./)
    unitOn[registration] = unit.id
    systemOn[registration] = (unit as unknown as { system: string }).system
    const released = (await api(`/api/worksheets?aircraftId=${aircraftId[registration]}&state=released&pageSize=1`, { cookie: cookies.admin })).body
    releasedOn[registration] = released.items[0].id
  }
  // An open worksheet with a photo on one aircraft at each station and on the customer's.
  for (const registration of ['QX-FMA', 'QX-FMK', 'QX-FML']) {
    const flow = await fillWorksheet(cookies.lead, unitOn[registration]!)
    draftOn[registration] = flow.id
    const photo = await upload('/api/attachments', { worksheetId: String(flow.id), kind: 'gauge-photo' }, { name: 'gauge.png', bytes: png }, cookies.lead)
    expect(photo.status).toBe(201)
    photoOn[registration] = photo.body.id
  }
}, 120_000)

describe.each(Object.keys(MATRIX) as Who[])('what %s sees', (who) => {
  const { sees, stations } = MATRIX[who]
  const hidden = ALL.filter(registration => !(sees as readonly string[]).includes(registration))
  const get = (path: string) => api(path, { cookie: cookies[who] })

  it('lists, searches and exports only the aircraft, units and worksheets in scope', async () => {
    const fleet = (await get('/api/aircraft?pageSize=100')).body.items as { registration: string, operator: string }[]
    expect(fleet.map(aircraft => aircraft.registration).sort()).toEqual([...sees])
    expect((await get('/api/aircraft/options')).body.bases).toEqual(stations)
    expect(named(await csv('/api/aircraft/export', cookies[who]))).toEqual([...sees])

    const units = (await get('/api/accumulators?installed=true&pageSize=500')).body.items as { aircraft: { registration: string } }[]
    expect([...new Set(units.map(unit => unit.aircraft.registration))].sort()).toEqual([...sees])
    expect(named(await csv('/api/accumulators/export', cookies[who]))).toEqual([...sees])

    const worksheets = (await get('/api/worksheets?pageSize=200')).body.items as { registration: string }[]
    expect([...new Set(worksheets.map(row => row.registration))].sort()).toEqual([...sees])
    for (const registration of hidden) {
      expect((await get(`/api/worksheets?q=${registration}`)).body.items, `search ${registration}`).toEqual([])
      expect((await get(`/api/worksheets?aircraftId=${aircraftId[registration]}`)).body.items).toEqual([])
    }
    expect(named(await csv('/api/worksheets/export', cookies[who]))).toEqual([...sees])
  })

  it('answers a record out of scope as not found: aircraft, unit, label, worksheet, PDF, photo', async () => {
    for (const registration of ALL) {
      const visible = (sees as readonly string[]).includes(registration)
      const expected = (ok: number) => (visible ? ok : 404)
      expect((await get(`/api/aircraft/${aircraftId[registration]}`)).status, `aircraft ${registration}`).toBe(expected(200))
      expect((await get(`/api/accumulators/${unitOn[registration]}`)).status, `unit on ${registration}`).toBe(expected(200))
      expect((await fetch(`${baseURL()}/api/accumulators/${unitOn[registration]}/label`, { headers: { cookie: cookies[who] } })).status)
        .toBe(expected(200))
      expect((await get(`/api/worksheets/${releasedOn[registration]}`)).status, `worksheet on ${registration}`).toBe(expected(200))
      const pdf = await fetch(`${baseURL()}/api/worksheets/${releasedOn[registration]}/pdf`, { headers: { cookie: cookies[who] } })
      expect(pdf.status, `PDF of ${registration}`).toBe(expected(200))
      expect((await get(`/api/trends/precharge/${unitOn[registration]}`)).status).toBe(expected(200))
      if (photoOn[registration]) {
        const photo = await fetch(`${baseURL()}/api/attachments/${photoOn[registration]}`, { headers: { cookie: cookies[who] } })
        expect(photo.status, `photo on ${registration}`).toBe(expected(200))
      }
    }
  })

  it('trends, cycle checks, the due list with its CSV and calendar, and Home hold only what is in scope', async () => {
    const precharge = (await get('/api/trends/precharge?pageSize=100')).body.items as { registration: string }[]
    expect([...new Set(precharge.map(row => row.registration))].sort()).toEqual([...sees])
    const cycles = (await get('/api/trends/cycles?pageSize=100')).body
    for (const row of cycles.items as { registration: string }[]) expect(sees).toContain(row.registration)
    for (const row of cycles.flagged as { registration: string }[]) expect(sees).toContain(row.registration)
    for (const registration of hidden) {
      expect((await get(`/api/trends/cycles/series?aircraftId=${aircraftId[registration]}&system=${encodeURIComponent(systemOn[registration]!)}`)).status).toBe(404)
    }
    const checks = (await get('/api/cycle-checks?pageSize=500')).body.items as { registration: string }[]
    expect(checks.every(check => sees.includes(check.registration as never))).toBe(true)

    const due = (await get('/api/due')).body
    const dueOn = new Set((due.items as { registration: string }[]).map(item => item.registration))
    expect([...dueOn].sort()).toEqual([...sees])
    expect(due.stations).toEqual(stations)
    expect(named(await csv('/api/due/export', cookies[who]))).toEqual([...sees])
    for (const station of ['Harlow Moor', 'Skelby']) {
      const feed = await csv(`/api/due/calendar?station=${encodeURIComponent(station)}`, cookies[who])
      for (const registration of named(feed)) expect(sees).toContain(registration)
    }
    const work = JSON.stringify((await get('/api/me/work')).body)
    for (const registration of named(work)) expect(sees).toContain(registration)
  })

  it('the audit trail and its export are the administrators\', who see the whole organisation', async () => {
    const exported = await fetch(`${baseURL()}/api/audit/export`, { headers: { cookie: cookies[who] } })
    expect(exported.status).toBe(who === 'admin' ? 200 : 403)
    expect((await get('/api/audit/events')).status).toBe(who === 'admin' ? 200 : 403)
    await exported.body?.cancel()
  })

  it('says what it may see, and keeps the calculation defaults to its own stations', async () => {
    const scope = (await get('/api/me/scope')).body
    expect((scope.stations as { name: string }[]).map(station => station.name)).toEqual(stations)
    const me = (await get('/api/me')).body
    for (const station of ['Harlow Moor', 'Skelby']) {
      const answer = await api('/api/me/preferences', { method: 'PATCH', cookie: cookies[who], body: { ...me.preferences, stationName: station } })
      expect(answer.status, station).toBe((stations as readonly string[]).includes(station) ? 200 : 422)
      if (answer.status === 422) expect(answer.body.data.field).toBe('stationName')
    }
    await api('/api/me/preferences', { method: 'PATCH', cookie: cookies[who], body: me.preferences })
  })

  it.runIf(MATRIX[who].role === 'technician')('works, attaches, syncs and records only in scope; the station copy holds only its units', async () => {
    const reference = (await get('/api/field/reference')).body
    const units = reference.units as { aircraft: { registration: string } }[]
    for (const unit of units) expect(sees).toContain(unit.aircraft.registration)
    for (const registration of hidden) {
      const start = await api('/api/worksheets', {
        cookie: cookies[who],
        body: { accumulatorId: unitOn[registration], workOrder: 'WO-SCOPE-1', reason: 'scheduled' },
      })
      expect(start.status, `start on ${registration}`).toBe(422)
      for (const action of ['sign', 'discard']) {
        const body = action === 'sign' ? { certify: true, password: 'chargewell-demo' } : { reason: 'Not mine' }
        const answer = await api(`/api/worksheets/${releasedOn[registration]}/${action}`, { cookie: cookies[who], body })
        expect(answer.status, `${action} on ${registration}`).toBe(404)
      }
      const checks = (await api(`/api/cycle-checks?aircraftId=${aircraftId[registration]}`, { cookie: cookies.admin })).body.items
      if (checks.length) {
        const id = checks[0].id as number
        const withdrawn = await api(`/api/cycle-checks/${id}/withdraw`, { cookie: cookies[who], body: { reason: 'Out of my scope' } })
        expect(withdrawn.status, `withdraw a check on ${registration}`).toBe(404)
      }
      expect(start.body.data.field).toBe('accumulatorId')
      const check = await api('/api/cycle-checks', {
        cookie: cookies[who],
        body: {
          aircraftId: aircraftId[registration],
          system: systemOn[registration],
          cutOut: { value: 3000, unit: 'psi', basis: 'gauge' },
          cutIn: { value: 2600, unit: 'psi', basis: 'gauge' },
          interval: { value: 60, unit: 's' },
          fluidTemperature: { value: 40, unit: 'C' },
        },
      })
      expect(check.status, `cycle check on ${registration}`).toBe(422)
      expect(check.body.data.field).toBe('system')
      if (draftOn[registration]) {
        const patch = await api(`/api/worksheets/${draftOn[registration]}`, { method: 'PATCH', cookie: cookies[who], body: { step: 'action', kind: 'none' } })
        expect(patch.status).toBe(404)
        const photo = await upload('/api/attachments', { worksheetId: String(draftOn[registration]), kind: 'gauge-photo' }, { name: 'x.png', bytes: png }, cookies[who])
        expect(photo.status).toBe(404)
      }
      // A worksheet filled offline for a unit out of scope is not started when the device sends it.
      const sent = await api('/api/worksheets/sync', {
        cookie: cookies[who],
        body: {
          clientId: randomUUID(),
          accumulatorId: unitOn[registration],
          specificationId: 1,
          workOrder: 'WO-SCOPE-SYNC',
          reason: 'scheduled',
          startedAt: new Date(Date.now() - 600_000).toISOString(),
          steps: [],
        },
      })
      expect(sent.status, `sync on ${registration}`).toBe(422)
      expect(sent.body.data.field).toBe('accumulatorId')
    }
  })

  it.runIf(MATRIX[who].role === 'inspector')('countersigns only in scope', async () => {
    for (const registration of hidden) {
      const answer = await api(`/api/worksheets/${releasedOn[registration]}/countersign`, { cookie: cookies[who], body: { certify: true, password: 'chargewell-demo' } })
      expect(answer.status, `countersign on ${registration}`).toBe(404)
      const returned = await api(`/api/worksheets/${releasedOn[registration]}/return`, { cookie: cookies[who], body: { reason: 'Not in my scope at all' } })
      expect(returned.status, `return on ${registration}`).toBe(404)
      const options = await get(`/api/worksheets/${releasedOn[registration]}/signing-options?capacity=inspector`)
      expect(options.status).toBe(404)
    }
  })
})

describe('granting stations and operators', () => {
  it('an administrator changes a user\'s grants (audited) and their next request sees it; bad grants name the field', async () => {
    const users = (await api('/api/admin/users', { cookie: cookies.admin })).body as { id: number, email: string, stationIds: number[] | null }[]
    const engineer = users.find(user => user.email === SCOPED_DEMO.harlowEngineer)!
    const stations = (await api('/api/admin/stations', { cookie: cookies.admin })).body as { id: number, name: string, aircraft: number }[]
    expect(stations.map(station => [station.name, station.aircraft])).toEqual([['Harlow Moor', 3], ['Skelby', 3]])
    const operators = (await api('/api/admin/operators', { cookie: cookies.admin })).body as { id: number, name: string, own: boolean, aircraft: number }[]
    expect(operators.map(operator => [operator.name, operator.own, operator.aircraft])).toEqual([['Fellmoor Regional', true, 5], ['Corran Isles Airways', false, 1]])
    const skelby = stations.find(station => station.name === 'Skelby')!
    const corran = operators.find(operator => !operator.own)!

    const granted = await api(`/api/admin/users/${engineer.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: [skelby.id], operatorIds: [corran.id] } })
    expect(granted.status).toBe(200)
    const seen = (await api('/api/aircraft', { cookie: cookies.harlowEngineer })).body.items as { registration: string }[]
    expect(seen.map(aircraft => aircraft.registration)).toEqual(['QX-FML'])
    const events = (await api('/api/audit/events?entity=user&pageSize=200', { cookie: cookies.admin })).body
    expect(JSON.stringify(events)).toMatch(/scope-changed/)

    const bad = await api(`/api/admin/users/${engineer.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: [999999], operatorIds: null } })
    expect(bad.status).toBe(422)
    expect(bad.body.data.field).toBe('stationIds')
    const empty = await api(`/api/admin/users/${engineer.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: [], operatorIds: null } })
    expect(empty.status).toBe(400)
    expect((await api(`/api/admin/users/${engineer.id}/scope`, { method: 'PUT', cookie: cookies.engineer, body: { stationIds: null, operatorIds: null } })).status).toBe(403)

    const harlow = stations.find(station => station.name === 'Harlow Moor')!
    await api(`/api/admin/users/${engineer.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: [harlow.id], operatorIds: null } })
    expect(((await api('/api/aircraft', { cookie: cookies.harlowEngineer })).body.items as unknown[]).length).toBe(3)
  })

  it('reads racing a change of grants see the old set or the new one, never a mix, never a 5xx', async () => {
    const users = (await api('/api/admin/users', { cookie: cookies.admin })).body as { id: number, email: string }[]
    const technician = users.find(user => user.email === SCOPED_DEMO.skelbyTechnician)!
    const stations = (await api('/api/admin/stations', { cookie: cookies.admin })).body as { id: number, name: string }[]
    const [harlow, skelby] = ['Harlow Moor', 'Skelby'].map(name => stations.find(station => station.name === name)!.id)
    const grants = [[harlow], [skelby]]
    const answers = await Promise.all(Array.from({ length: 24 }, (_, index) => index % 4 === 0
      ? api(`/api/admin/users/${technician.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: grants[(index / 4) % 2], operatorIds: null } })
      : api('/api/aircraft?pageSize=100', { cookie: cookies.skelbyTechnician })))
    const seen = new Set<string>()
    for (const answer of answers) {
      expect(answer.status).toBeLessThan(500)
      if (Array.isArray(answer.body.items)) seen.add((answer.body.items as { registration: string }[]).map(row => row.registration).sort().join(','))
    }
    for (const set of seen) expect(['QX-FMA,QX-FMB,QX-FMJ', 'QX-FMC,QX-FMK,QX-FML']).toContain(set)
    await api(`/api/admin/users/${technician.id}/scope`, { method: 'PUT', cookie: cookies.admin, body: { stationIds: [skelby], operatorIds: null } })
    expect(((await api('/api/aircraft', { cookie: cookies.skelbyTechnician })).body.items as unknown[]).length).toBe(3)
  })

  it('stations and operators are a register: an aircraft must name one of each; names and codes are unique', async () => {
    const station = await api('/api/admin/stations', {
      cookie: cookies.admin,
      body: { name: 'Orla Point', code: 'orp', timeZone: 'Europe/Dublin', elevation: { value: 31, unit: 'm' } },
    })
    expect(station.status).toBe(201)
    expect(station.body.code).toBe('ORP')
    const again = await api('/api/admin/stations', {
      cookie: cookies.admin,
      body: { name: 'Orla Point', code: 'ORQ', timeZone: 'UTC', elevation: { value: 0, unit: 'ft' } },
    })
    expect(again.status).toBe(409)
    const zone = await api('/api/admin/stations', {
      cookie: cookies.admin,
      body: { name: 'Nowhere', code: 'NWH', timeZone: 'Mars/Olympus', elevation: { value: 0, unit: 'ft' } },
    })
    expect(zone.status).toBe(400)
    expect(JSON.stringify(zone.body)).toMatch(/timeZone/)

    const unknownBase = await api('/api/aircraft', {
      cookie: cookies.admin,
      body: { registration: 'QX-ORA', fleetNumber: '981', type: 'Tarnwing 46', base: 'Atlantis' },
    })
    expect(unknownBase.status).toBe(422)
    expect(unknownBase.body.data.field).toBe('base')
    const unknownOperator = await api('/api/aircraft', {
      cookie: cookies.admin,
      body: { registration: 'QX-ORA', fleetNumber: '981', type: 'Tarnwing 46', base: 'Orla Point', operator: 'Nobody Air' },
    })
    expect(unknownOperator.status).toBe(422)
    expect(unknownOperator.body.data.field).toBe('operator')
    const created = await api('/api/aircraft', {
      cookie: cookies.admin,
      body: { registration: 'QX-ORA', fleetNumber: '981', type: 'Tarnwing 46', base: 'Orla Point', operator: 'CIA' },
    })
    expect(created.status).toBe(201)
    expect(created.body.operator).toBe('Corran Isles Airways')
    // Nobody granted Skelby or Harlow Moor only sees the new station's aircraft.
    for (const who of ['skelbyTechnician', 'harlowEngineer', 'corranInspector'] as const) {
      const seen = (await api('/api/aircraft?pageSize=100', { cookie: cookies[who] })).body.items as { registration: string }[]
      expect(seen.map(aircraft => aircraft.registration)).not.toContain('QX-ORA')
    }
    expect(((await api('/api/aircraft?pageSize=100', { cookie: cookies.engineer })).body.items as { registration: string }[])
      .map(aircraft => aircraft.registration)).toContain('QX-ORA')
  })
})
