import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
})

describe('pre-charge loss trends', () => {
  it('rank the fleet by loss rate; the demo\'s slowly leaking unit is flagged, the tight ones are not', async () => {
    const answer = await api('/api/trends/precharge', { cookie: cookies.technician })
    expect(answer.status).toBe(200)
    const [first] = answer.body.items
    expect(first).toMatchObject({ registration: 'QX-FMC', position: 'Normal brake, nose bay', flagged: true })
    // The seed loses 0.75 psi/day at the reference temperature (plus gauge rounding to 5 psi).
    expect(first.lossRate).toBeGreaterThan(0.6)
    expect(first.lossRate).toBeLessThan(0.9)
    expect(first.lossRateStandardError).toBeGreaterThan(0)
    const losses = answer.body.items.map((item: { lossRate: number | null }) => item.lossRate ?? -Infinity)
    expect([...losses].sort((a: number, b: number) => b - a)).toEqual(losses)
    // Units whose specification other test files leave alone, with tight demo histories, are not flagged.
    const untouched = answer.body.items.filter((item: { partNumber: string }) =>
      ['FA-2260-02', 'FJ-3340-02'].includes(item.partNumber),
    )
    expect(untouched.length).toBeGreaterThanOrEqual(6)
    expect(untouched.filter((item: { flagged: boolean }) => item.flagged)).toEqual([])
  })

  it('filter by aircraft type, base, position and part number', async () => {
    const brakes = await api('/api/trends/precharge?partNumber=FA-2240-01&base=Skelby', { cookie: cookies.engineer })
    expect(brakes.body.items.map((item: { registration: string }) => item.registration)).toEqual(['QX-FMC'])
    expect(
      (
        await api('/api/trends/precharge?flagged=false&type=Tarnwing 72', { cookie: cookies.engineer })
      ).body.items.every((item: { type: string, flagged: boolean }) => item.type === 'Tarnwing 72' && !item.flagged),
    ).toBe(true)
  })

  it('give one unit\'s readings carried to the reference temperature, with the band and each service', async () => {
    const list = await api('/api/trends/precharge?partNumber=FA-2240-01&base=Skelby', { cookie: cookies.inspector })
    const unit = await api(`/api/trends/precharge/${list.body.items[0].accumulatorId}`, { cookie: cookies.inspector })
    expect(unit.body.trend.lowLimit).toBeCloseTo(950, 6)
    expect(unit.body.services.length).toBeGreaterThanOrEqual(5)
    expect(unit.body.services.every((service: { action: string }) => service.action === 'charge')).toBe(true)
    expect(unit.body.trend.fit.segments).toBeGreaterThanOrEqual(5)
    expect((await api('/api/trends/precharge/abc', { cookie: cookies.inspector })).status).toBe(400)
  })

  it('reading the trends writes nothing and mails nobody', async () => {
    const before = (await api('/api/admin/outbox', { cookie: cookies.admin })).body.notifications.length
    for (let read = 0; read < 3; read++) {
      expect((await api('/api/trends/precharge', { cookie: cookies.engineer })).status).toBe(200)
      expect((await api('/api/trends/cycles', { cookie: cookies.engineer })).status).toBe(200)
    }
    expect((await api('/api/admin/outbox', { cookie: cookies.admin })).body.notifications.length).toBe(before)
  })
})

describe('pump cycle checks', () => {
  it('the shortening system is flagged, with the advice to check the pre-charge first', async () => {
    const answer = await api('/api/trends/cycles', { cookie: cookies.technician })
    const [first] = answer.body.items
    expect(first).toMatchObject({ registration: 'QX-FMJ', system: 'Hydraulic system 1', flagged: true })
    expect(first.drop).toBeGreaterThan(answer.body.dropShare)
    expect(first.message).toMatch(/low pre-charge[\s\S]*Check the accumulator's pre-charge first/)
    expect(answer.body.items.filter((item: { flagged: boolean }) => item.flagged)).toHaveLength(1)
  })

  it('a technician logs a check; the server works out the leak rate (by hand, Boyle, for the ideal case)', async () => {
    const fleet = (await api('/api/aircraft?q=QX-FMA', { cookie: cookies.technician })).body.items[0]
    const body = {
      aircraftId: fleet.id,
      system: 'Hydraulic system A',
      cutOut: { value: 3000, unit: 'psi', basis: 'gauge' },
      cutIn: { value: 2600, unit: 'psi', basis: 'gauge' },
      interval: { value: 7, unit: 'min' },
      fluidTemperature: { value: 21, unit: 'C' },
      checkedAt: '2026-11-30',
      ambient: { pressure: { value: 14.695949, unit: 'psi', basis: 'absolute' } },
    }
    const created = await api('/api/cycle-checks', { cookie: cookies.technician, body })
    expect(created.status).toBe(201)
    // Real gas, but a sanity bound from Boyle (ideal): 120 in³ × 1514.7 × (1/2614.7 − 1/3014.7) = 9.22 in³ over
    // 7 min = 1.32 in³/min.
    expect(created.body.results.leakRate.unit).toBe('in3/min')
    expect(created.body.results.leakRate.value).toBeGreaterThan(1.0)
    expect(created.body.results.leakRate.value).toBeLessThan(1.5)
    expect((await api('/api/cycle-checks', { cookie: cookies.inspector, body })).status).toBe(403)
    expect(
      (await api('/api/cycle-checks', { cookie: cookies.engineer, body: { ...body, system: 'Hydraulic system Z' } }))
        .status,
    ).toBe(422)
    // Every problem at once, each on its own field: cut-in above cut-out, and a 99,999-minute interval.
    const wrong = await api('/api/cycle-checks', {
      cookie: cookies.engineer,
      body: { ...body, cutIn: { value: 3100, unit: 'psi', basis: 'gauge' }, interval: { value: 99_999, unit: 'min' } },
    })
    expect(wrong.status).toBe(400)
    const issues = Object.fromEntries(
      wrong.body.data.issues.map((issue: { field: string, message: string }) => [issue.field, issue.message]),
    )
    expect(issues['cutIn.value']).toMatch(/cuts in below the pressure it cuts out at \(3000 psi\)/)
    expect(issues['interval.value']).toMatch(/between 0\.0833 and 1440 min/)
    const list = await api(`/api/cycle-checks?aircraftId=${fleet.id}`, { cookie: cookies.inspector })
    expect(list.body.total).toBeGreaterThanOrEqual(13)
  })
})

describe('alerts are raised by the writes that change a trend', () => {
  it('two cycle checks at once that flag a system mail the engineers once; the next one mails nothing', async () => {
    const aircraft = (await api('/api/aircraft?q=QX-FMK', { cookie: cookies.technician })).body.items[0]
    const check = (seconds: number) =>
      api('/api/cycle-checks', {
        cookie: cookies.technician,
        body: {
          aircraftId: aircraft.id,
          system: 'Hydraulic system 1',
          cutOut: { value: 3000, unit: 'psi', basis: 'gauge' },
          cutIn: { value: 2600, unit: 'psi', basis: 'gauge' },
          interval: { value: seconds, unit: 's' },
          fluidTemperature: { value: 40, unit: 'C' },
          checkedAt: '2026-12-01',
        },
      })
    const answers = await Promise.all([check(150), check(140)])
    expect(answers.map(answer => answer.status)).toEqual([201, 201])
    expect((await check(145)).status).toBe(201)
    const alertsNow = async () => ((await api('/api/admin/outbox', { cookie: cookies.admin })).body.received as {
      to: string[]
      subject: string
      text: string
    }[]).filter(
      message =>
        message.to.includes(DEMO.engineer)
        && message.subject.startsWith('Trend alert')
        && message.subject.includes('QX-FMK Hydraulic system 1'),
    )
    // Mail goes out from the outbox in the background: wait until nothing is left to send, then count.
    await expect.poll(async () => ((await api('/api/admin/outbox', { cookie: cookies.admin })).body.notifications as { status: string }[])
      .filter(message => message.status === 'queued' || message.status === 'sending').length).toBe(0)
    const alerts = await alertsNow()
    expect(alerts).toHaveLength(1)
    expect(alerts[0]!.text).toMatch(/shorter than its baseline/)
    const cycles = (await api('/api/trends/cycles', { cookie: cookies.engineer })).body.items
    expect(
      cycles.find(
        (item: { registration: string, system: string }) =>
          item.registration === 'QX-FMK' && item.system === 'Hydraulic system 1',
      ).flagged,
    ).toBe(true)
  })

  it('a released as-found joins its unit\'s trend at once', async () => {
    const { fillWorksheet, finishAndSign, unitAt } = await import('../support/worksheet-flow')
    const unit = await unitAt(cookies.technician!, 'QX-FMA', /Main hydraulic/)
    const before = (await api(`/api/trends/precharge/${unit.id}`, { cookie: cookies.engineer })).body.services.length
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    expect((await finishAndSign(cookies.technician!, flow)).status).toBe(200)
    expect((await api(`/api/trends/precharge/${unit.id}`, { cookie: cookies.engineer })).body.services.length).toBe(
      before,
    )
    expect(
      (
        await api(`/api/worksheets/${flow.id}/countersign`, {
          cookie: cookies.inspector,
          body: { password: 'chargewell-demo', certify: true },
        })
      ).status,
    ).toBe(200)
    const after = (await api(`/api/trends/precharge/${unit.id}`, { cookie: cookies.engineer })).body
    expect(after.services.length).toBe(before + 1)
    expect(after.services.at(-1).worksheetId).toBe(flow.id)
  })
})

describe('trends bounded by what a person can read', () => {
  it('pages the systems (largest drop first) with a bounded series each, and lists the flagged ones', async () => {
    const first = await api('/api/trends/cycles?pageSize=2', { cookie: cookies.engineer })
    expect(first.status).toBe(200)
    expect(first.body.items).toHaveLength(2)
    expect(first.body.total).toBeGreaterThan(2)
    expect(first.body.items[0].flagged).toBe(true)
    expect(first.body.flagged.map((row: { system: string }) => row.system)).toContain(first.body.items[0].system)
    for (const row of first.body.items) {
      expect(row.series.length).toBeLessThanOrEqual(60)
      expect(row.series.length).toBe(Math.min(60, row.checks))
      expect(row).not.toHaveProperty('inputs')
    }
    const second = await api('/api/trends/cycles?pageSize=2&page=2', { cookie: cookies.engineer })
    expect(second.body.items[0].system + second.body.items[0].registration)
      .not.toBe(first.body.items[0].system + first.body.items[0].registration)
    expect((await api('/api/trends/cycles?pageSize=101', { cookie: cookies.engineer })).status).toBe(400)
  })

  it('gives one system\'s whole series on demand', async () => {
    const [row] = (await api('/api/trends/cycles?pageSize=1', { cookie: cookies.engineer })).body.items
    const series = await api(`/api/trends/cycles/series?aircraftId=${row.aircraftId}&system=${encodeURIComponent(row.system)}`, { cookie: cookies.engineer })
    expect(series.status).toBe(200)
    expect(series.body.items).toHaveLength(row.checks)
    expect((await api('/api/trends/cycles/series?aircraftId=x&system=', { cookie: cookies.engineer })).status).toBe(400)
  })

  it('pages the units by loss rate, fastest loss first, with the total', async () => {
    const first = await api('/api/trends/precharge?pageSize=3', { cookie: cookies.engineer })
    expect(first.status).toBe(200)
    expect(first.body.items).toHaveLength(3)
    expect(first.body.total).toBeGreaterThan(3)
    const rates = first.body.items.map((row: { lossRate: number | null }) => row.lossRate ?? Number.NEGATIVE_INFINITY)
    expect([...rates].sort((a, b) => b - a)).toEqual(rates)
    const all = await api('/api/trends/precharge?pageSize=100', { cookie: cookies.engineer })
    expect(all.body.items[0].accumulatorId).toBe(first.body.items[0].accumulatorId)
    expect((await api('/api/trends/precharge?pageSize=500', { cookie: cookies.engineer })).status).toBe(400)
  })

  it('answers pages and JSON compressed when asked, and plain when not', async () => {
    const { baseURL } = await import('../support/file-server')
    const compressed = await fetch(`${baseURL()}/api/trends/precharge?pageSize=50`, {
      headers: { 'cookie': cookies.engineer!, 'accept-encoding': 'br, gzip' },
    })
    expect(compressed.headers.get('content-encoding')).toBe('br')
    expect(compressed.headers.get('vary')).toMatch(/Accept-Encoding/i)
    // fetch decodes it: the body is the same JSON.
    expect((await compressed.json()).items.length).toBeGreaterThan(0)
    const gzip = await fetch(`${baseURL()}/login`, { headers: { 'accept-encoding': 'gzip' } })
    expect(gzip.headers.get('content-encoding')).toBe('gzip')
    expect(await gzip.text()).toMatch(/<html/)
    const plain = await fetch(`${baseURL()}/api/trends/precharge?pageSize=50`, {
      headers: { 'cookie': cookies.engineer!, 'accept-encoding': 'identity' },
    })
    expect(plain.headers.get('content-encoding')).toBeNull()
  })
})
