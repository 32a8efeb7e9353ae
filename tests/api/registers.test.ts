import { beforeAll, describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { api, DEMO, signIn } from '../support/api'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
})

async function postCsv(path: string, csv: string, cookie: string) {
  const response = await fetch(`${baseURL()}${path}`, {
    method: 'POST',
    headers: { 'content-type': 'text/csv', cookie },
    body: csv,
  })
  return { status: response.status, body: await response.json() }
}

const newSpecification = {
  partNumber: 'FX-9001-01',
  revision: 'A',
  title: 'Test accumulator',
  accumulatorType: 'piston',
  gasVolume: 100,
  gasVolumeUnit: 'in3',
  pressureUnit: 'psi',
  pressureBasis: 'gauge',
  referencePressure: 1200,
  referenceTemperature: 21,
  referenceTemperatureUnit: 'C',
  toleranceMinus: 50,
  tolerancePlus: 50,
  toleranceUnit: 'psi',
  correctionMethod: 'gas-law',
  gasModel: 'real',
  maxPressure: 3000,
  minPressure: 1500,
  settleMinutes: 10,
  dataReference: 'TEST SMM 29-99-00',
  dataRevision: 'Rev 1',
}

describe('specifications', () => {
  it('an engineer creates one; a technician cannot; the same part number twice is refused', async () => {
    expect((await api('/api/specifications', { cookie: cookies.technician, body: {} })).status).toBe(403)
    expect((await api('/api/specifications', { cookie: cookies.engineer, body: {} })).status).toBe(400)
    const created = await api('/api/specifications', { cookie: cookies.engineer, body: newSpecification })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ partNumber: 'FX-9001-01', revision: 'A', status: 'current' })
    expect((await api('/api/specifications', { cookie: cookies.engineer, body: newSpecification })).status).toBe(409)
    const bad = await api('/api/specifications', {
      cookie: cookies.engineer,
      body: { ...newSpecification, partNumber: 'FX-9002', minPressure: 3100 },
    })
    expect(bad.body.data.issues[0].field).toBe('minPressure')
  })

  it('a change to approved-data figures is a new revision that supersedes the old; worksheets keep theirs', async () => {
    const current = (await api('/api/specifications?q=FA-2210-03', { cookie: cookies.engineer })).body.items[0]
    const used = (await api(`/api/worksheets?pageSize=1&state=released`, { cookie: cookies.engineer })).body.items[0]
    const local = await api(`/api/specifications/${current.id}`, {
      method: 'PATCH',
      cookie: cookies.engineer,
      body: { lossThresholdPerDay: 0.5 },
    })
    expect(local.status).toBe(200)
    expect(local.body).toMatchObject({ id: current.id, revision: 'C', lossThresholdPerDay: 0.5 })
    const noRevision = await api(`/api/specifications/${current.id}`, {
      method: 'PATCH',
      cookie: cookies.engineer,
      body: { referencePressure: 1550 },
    })
    expect(noRevision.status).toBe(422)
    expect(noRevision.body.data.field).toBe('revision')
    const revised = await api(`/api/specifications/${current.id}`, {
      method: 'PATCH',
      cookie: cookies.engineer,
      body: { referencePressure: 1550, revision: 'D', dataRevision: 'Rev 15' },
    })
    expect(revised.status).toBe(201)
    expect(revised.body).toMatchObject({
      partNumber: 'FA-2210-03',
      revision: 'D',
      referencePressure: 1550,
      status: 'current',
    })
    expect((await api(`/api/specifications/${current.id}`, { cookie: cookies.engineer })).body.status).toBe(
      'superseded',
    )
    expect(
      (
        await api(`/api/specifications/${current.id}`, {
          method: 'PATCH',
          cookie: cookies.engineer,
          body: { title: 'x y z' },
        })
      ).status,
    ).toBe(409)
    const worksheet = (await api(`/api/worksheets/${used.id}`, { cookie: cookies.engineer })).body
    expect(['A', 'B', 'C', 'D']).toContain(worksheet.content.specification.revision)
    if (worksheet.content.specification.partNumber === 'FA-2210-03')
      expect(worksheet.content.specification.revision).toBe('C')
    const all = await api('/api/specifications?status=all&q=FA-2210-03', { cookie: cookies.technician })
    expect(all.body.items.map((spec: { revision: string }) => spec.revision).sort()).toEqual(['C', 'D'])
  })

  it('imports from CSV: a bad row stops the whole file, with the line and reason', async () => {
    const header
      = 'partNumber,revision,title,accumulatorType,gasVolume,gasVolumeUnit,pressureUnit,pressureBasis,referencePressure,referenceTemperature,referenceTemperatureUnit,toleranceMinus,tolerancePlus,toleranceUnit,correctionMethod,gasModel,maxPressure,minPressure,settleMinutes,checkIntervalDays,lossThresholdPerDay,dataReference,dataRevision,tablePoints'
    const good
      = 'FX-7001-01,A,Imported piston,piston,90,in3,psi,gauge,1100,21,C,40,40,psi,gas-law,real,3000,1400,10,90,,IMP SMM 1,Rev 1,'
    const table
      = 'FX-7002-01,A,Imported table,bladder,1.5,L,bar,gauge,100,20,C,3,3,bar,table,real,200,110,15,,,IMP SMM 2,Rev 1,-20 C 90; 20 C 100; 60 C 110'
    const badNumber
      = 'FX-7003-01,A,Bad,piston,lots,in3,psi,gauge,1100,21,C,40,40,psi,gas-law,real,3000,1400,10,,,IMP,Rev 1,'
    const badTable
      = 'FX-7004-01,A,Bad table,piston,90,in3,psi,gauge,1100,21,C,40,40,psi,table,real,3000,1400,10,,,IMP,Rev 1,warm 1100'
    const refused = await postCsv(
      '/api/specifications/import',
      [header, good, table, badNumber, badTable].join('\n'),
      cookies.engineer!,
    )
    expect(refused.status).toBe(422)
    expect(refused.body.message).toMatch(/Nothing was imported/)
    expect(refused.body.data.rejected).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ line: 4, field: 'gasVolume' }),
        expect.objectContaining({ line: 5, field: 'tablePoints' }),
      ]),
    )
    expect((await api('/api/specifications?q=FX-7001', { cookie: cookies.engineer })).body.total).toBe(0)
    const accepted = await postCsv('/api/specifications/import', [header, good, table].join('\n'), cookies.engineer!)
    expect(accepted).toMatchObject({ status: 200, body: { imported: 2 } })
    const imported = (await api('/api/specifications?q=FX-7002', { cookie: cookies.engineer })).body.items[0]
    expect(imported.tablePoints).toHaveLength(3)
    expect((await postCsv('/api/specifications/import', [header, good].join('\n'), cookies.technician!)).status).toBe(
      403,
    )
  })
})

describe('fleet', () => {
  it('searches, filters, sorts and pages the aircraft', async () => {
    const page = await api('/api/aircraft?type=Tarnwing 72&sort=fleetNumber&direction=desc&pageSize=2', {
      cookie: cookies.technician,
    })
    expect(page.body.total).toBe(3)
    expect(page.body.items.map((aircraft: { fleetNumber: string }) => aircraft.fleetNumber)).toEqual(['723', '722'])
    expect((await api('/api/aircraft?q=fmc', { cookie: cookies.technician })).body.items[0].registration).toBe('QX-FMC')
    expect((await api('/api/aircraft?sort=colour', { cookie: cookies.technician })).status).toBe(400)
  })

  it('counts at most 10,000 matches and pages no further than that (a bounded read at any size)', async () => {
    const first = await api('/api/cycle-checks?pageSize=5', { cookie: cookies.technician })
    expect(first.status).toBe(200)
    expect(first.body.totalCapped).toBe(false)
    expect(first.body.total).toBeGreaterThan(5)
    const beyond = await api('/api/cycle-checks?pageSize=25&page=401', { cookie: cookies.technician })
    expect(beyond.status).toBe(400)
    expect(beyond.body.data.issues[0].field).toBe('page')
    expect(beyond.body.message).toMatch(/first 10000 matches/)
    expect((await api('/api/cycle-checks?pageSize=25&page=400', { cookie: cookies.technician })).status).toBe(200)
  })

  it('an admin adds an aircraft and moves a unit onto it; the unit keeps its history', async () => {
    expect((await api('/api/aircraft', { cookie: cookies.engineer, body: {} })).status).toBe(403)
    const aircraft = await api('/api/aircraft', {
      cookie: cookies.admin,
      body: { registration: 'qx-fmz', fleetNumber: '729', type: 'Tarnwing 72', base: 'Skelby' },
    })
    expect(aircraft.status).toBe(201)
    expect(aircraft.body.registration).toBe('QX-FMZ')
    expect(
      (
        await api('/api/aircraft', {
          cookie: cookies.admin,
          body: { registration: 'QX-FMZ', fleetNumber: '730', type: 'x', base: 'Skelby' },
        })
      ).status,
    ).toBe(409)
    const unit = (await api('/api/accumulators?q=QX-FML&pageSize=50', { cookie: cookies.admin })).body.items.find(
      (candidate: { position: string }) => /Parking/.test(candidate.position),
    )
    const moved = await api(`/api/accumulators/${unit.id}`, {
      method: 'PATCH',
      cookie: cookies.admin,
      body: {
        move: {
          aircraftId: aircraft.body.id,
          position: 'Parking/emergency brake, right wheel well',
          date: '2026-11-30',
          reason: 'Robbed for AOG',
        },
      },
    })
    expect(moved.status).toBe(200)
    expect(moved.body.aircraft.registration).toBe('QX-FMZ')
    const history = await api(`/api/accumulators/${unit.id}`, { cookie: cookies.technician })
    expect(history.body.installations).toEqual([
      expect.objectContaining({ aircraft: 'QX-FMZ', removedAt: null }),
      expect.objectContaining({ aircraft: 'QX-FML', removedAt: '2026-11-30', removalReason: 'Robbed for AOG' }),
    ])
    expect(history.body.worksheets.length).toBeGreaterThan(0)
    const badMove = await api(`/api/accumulators/${unit.id}`, {
      method: 'PATCH',
      cookie: cookies.admin,
      body: { move: { aircraftId: aircraft.body.id, date: '2026-12-01' } },
    })
    expect(badMove.body.data.issues[0].field).toBe('move.position')
  })

  it('imports accumulators: an unknown registration rejects the file', async () => {
    const header = 'partNumber,serialNumber,system,registration,position,installedAt'
    const refused = await postCsv(
      '/api/accumulators/import',
      `${header}\nFA-2240-01,SN9001,Brake system,QX-FMA,Spare bay,2026-11-01\nFA-2240-01,SN9002,Brake system,QX-NOPE,Spare bay,2026-11-01\n`,
      cookies.admin!,
    )
    expect(refused.status).toBe(422)
    expect(refused.body.data.rejected).toEqual([expect.objectContaining({ line: 3, field: 'registration' })])
    const accepted = await postCsv(
      '/api/accumulators/import',
      `${header}\nFA-2240-01,SN9001,Brake system,QX-FMA,Spare bay,2026-11-01\nFA-2240-01,SN9003,,,,\n`,
      cookies.admin!,
    )
    expect(accepted.body.imported).toBe(2)
    const duplicate = await postCsv(
      '/api/accumulators/import',
      `${header}\nFA-2240-01,SN9001,Brake system,,,\n`,
      cookies.admin!,
    )
    // A known unit is matched by part and serial number: emptying its aircraft would move it, which a cell may not.
    expect(duplicate.status).toBe(422)
    expect(duplicate.body.data.rejected[0].message).toMatch(/move it on its page/)
  })
})

describe('tools', () => {
  it('flags the expired gauge, filters by calibration, and lets an admin record a calibration', async () => {
    const expired = await api('/api/tools?calibration=expired', { cookie: cookies.technician })
    expect(expired.body.items.map((tool: { assetNumber: string }) => tool.assetNumber)).toContain('GA-0098')
    expect(expired.body.items.every((tool: { calibrationExpired: boolean }) => tool.calibrationExpired)).toBe(true)
    const extra = await api('/api/tools', {
      cookie: cookies.admin,
      body: {
        kind: 'gauge',
        assetNumber: 'GA-0200',
        description: 'Test gauge',
        rangeMax: 5000,
        rangeUnit: 'psi',
        accuracy: 0.25,
        accuracyUnit: '%FS',
        calibrationDue: '2026-01-01',
      },
    })
    expect(extra.body.calibrationExpired).toBe(true)
    const calibrated = await api(`/api/tools/${extra.body.id}`, {
      method: 'PATCH',
      cookie: cookies.admin,
      body: { calibrationDue: '2027-12-01' },
    })
    expect(calibrated.body.calibrationExpired).toBe(false)
    expect(
      (
        await api(`/api/tools/${extra.body.id}`, {
          method: 'PATCH',
          cookie: cookies.technician,
          body: { active: false },
        })
      ).status,
    ).toBe(403)
    const noRange = await api('/api/tools', {
      cookie: cookies.admin,
      body: { kind: 'gauge', assetNumber: 'GA-0201', description: 'No range' },
    })
    expect(noRange.body.data.issues.map((issue: { field: string }) => issue.field)).toEqual(['rangeMax', 'accuracy'])
  })

  it('exports the register and imports the same format back', async () => {
    const exported = await fetch(`${baseURL()}/api/tools/export`, { headers: { cookie: cookies.technician! } })
    const [header, ...lines] = (await exported.text()).trim().split(/\r?\n/)
    expect(header).toBe(
      'kind,assetNumber,description,rangeMax,rangeUnit,resolution,accuracy,accuracyUnit,calibrationDue,active',
    )
    const renamed = lines.filter(line => line.includes('GA-0141')).map(line => line.replace('GA-0141', 'GA-0141B'))
    const answer = await postCsv('/api/tools/import', [header, ...renamed].join('\n'), cookies.admin!)
    expect(answer.body).toMatchObject({ imported: 1, added: 1, updated: 0, preview: false, rejected: [] })
  })

  it('reports every problem of a row at once, in plain words, not the library\'s', async () => {
    const header
      = 'kind,assetNumber,description,rangeMax,rangeUnit,resolution,accuracy,accuracyUnit,calibrationDue,active'
    const answer = await postCsv(
      '/api/tools/import',
      [header, 'gauge,GA-X1,,abc,psi,,zz,%FS,2026-13-01,true', 'banana,GA-X2,Test,100,psi,,1,%FS,,true'].join('\n'),
      cookies.admin!,
    )
    expect(answer.status).toBe(422)
    const line2 = answer.body.data.rejected.filter((problem: { line: number }) => problem.line === 2)
    expect(
      Object.fromEntries(line2.map((problem: { field: string, message: string }) => [problem.field, problem.message])),
    ).toEqual({
      rangeMax: 'Not a number.',
      accuracy: 'Not a number.',
      description: 'Enter the description.',
      calibrationDue: 'Use a date like 2026-01-31.',
    })
    expect(answer.body.data.rejected.find((problem: { line: number }) => problem.line === 3)).toMatchObject({
      field: 'kind',
      message: 'The kind is gauge or cart.',
    })
    expect(JSON.stringify(answer.body)).not.toMatch(/Expected|received/)
  })
})
