/**
 * The due list: every installed unit's next check by station and by how soon, with its reason; its CSV,
 * the station's iCalendar feed (keyed address, or a session), and the technician's Home.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { addDays } from '../../shared/utils/due'
import { stationDate } from '../../shared/utils/station-time'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const role of ['technician', 'inspector', 'engineer'] as const) cookies[role] = await signIn(DEMO[role])
})

interface Item {
  accumulatorId: number
  station: string
  dueOn: string
  bucket: string
  reason: string
  broughtForward: boolean
  registration: string
}

describe('the due list', () => {
  it('lists every installed unit once, soonest first, by station, each with its reason', async () => {
    const all = (await api('/api/due', { cookie: cookies.engineer })).body
    const installed = (await api('/api/accumulators?installed=true&pageSize=500', { cookie: cookies.engineer })).body.total
    expect(all.items).toHaveLength(installed)
    expect(all.stations).toEqual(['Harlow Moor', 'Skelby'])
    expect(Object.values(all.counts as Record<string, number>).reduce((sum, count) => sum + count, 0)).toBe(installed)
    const dates = (all.items as Item[]).map(item => item.dueOn)
    expect(dates).toEqual([...dates].sort())
    for (const item of all.items as Item[]) expect(item.reason).toMatch(/Every \d+ days; last released check|Brought forward from|No released check/)
    const skelby = (await api('/api/due?station=Skelby', { cookie: cookies.engineer })).body
    expect((skelby.items as Item[]).every(item => item.station === 'Skelby')).toBe(true)
    expect(skelby.items.length).toBeGreaterThan(0)
    expect(skelby.items.length).toBeLessThan(installed)
    const bad = await api('/api/due?bucket=soon', { cookie: cookies.engineer })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(bad.body)).toContain('bucket')
  })

  it('a released check moves the unit to its interval after today', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMK', /System 1/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
    expect((await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { certify: true, password: DEMO_PASSWORD } })).status).toBe(200)
    expect((await api(`/api/worksheets/${flow.id}/countersign`, { cookie: cookies.inspector, body: { certify: true, password: DEMO_PASSWORD } })).status).toBe(200)
    const interval = flow.created.content.specification.checkIntervalDays as number
    const today = stationDate('UTC')
    await expect.poll(async () => ((await api('/api/due', { cookie: cookies.engineer })).body.items as Item[])
      .find(item => item.accumulatorId === unit.id)?.reason).toBe(`Every ${interval} days; last released check ${today}.`)
    const item = ((await api('/api/due', { cookie: cookies.engineer })).body.items as Item[]).find(entry => entry.accumulatorId === unit.id)!
    expect(item.dueOn).toBe(addDays(today, interval))
  })

  it('exports CSV and serves the station calendar to its keyed address, or to a session', async () => {
    const csv = await fetch(`${baseURL()}/api/due/export?station=Skelby`, { headers: { cookie: cookies.engineer! } })
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    const lines = (await csv.text()).trim().split('\r\n')
    expect(lines[0]).toBe('dueOn,bucket,station,registration,aircraftType,position,partNumber,serialNumber,lastCheckOn,scheduledOn,broughtForward,reason')
    const skelby = (await api('/api/due?station=Skelby', { cookie: cookies.engineer })).body
    expect(lines).toHaveLength(skelby.items.length + 1)

    expect(skelby.calendarAddress).toMatch(/\/api\/due\/calendar\?station=Skelby&user=\d+&key=/)
    const feed = await fetch(skelby.calendarAddress.replace(/^https?:\/\/[^/]+/, baseURL()))
    expect(feed.status).toBe(200)
    expect(feed.headers.get('content-type')).toMatch(/text\/calendar/)
    const text = await feed.text()
    expect(text).toMatch(/^BEGIN:VCALENDAR/)
    const soon = (skelby.items as Item[]).filter(item => item.bucket !== 'later')
    expect(text.match(/BEGIN:VEVENT/g)?.length ?? 0).toBe(soon.length)
    const user = new URL(skelby.calendarAddress).searchParams.get('user')!
    expect((await fetch(`${baseURL()}/api/due/calendar?station=Skelby&user=${user}&key=not-the-key`)).status).toBe(401)
    // The key of one station does not open another's, nor is it another user's.
    const key = new URL(skelby.calendarAddress).searchParams.get('key')!
    expect((await fetch(`${baseURL()}/api/due/calendar?station=Harlow%20Moor&user=${user}&key=${key}`)).status).toBe(401)
    expect((await fetch(`${baseURL()}/api/due/calendar?station=Skelby&user=${Number(user) + 1}&key=${key}`)).status).toBe(401)
    expect((await fetch(`${baseURL()}/api/due/calendar?station=Skelby`, { headers: { cookie: cookies.engineer! } })).status).toBe(200)
  })

  it('Home shows the technician what is due at their station this week', async () => {
    const work = (await api('/api/me/work', { cookie: cookies.technician })).body
    expect(work.due.station).toBe('Harlow Moor')
    expect((work.due.items as Item[]).every(item => item.station === 'Harlow Moor' && ['overdue', 'this-week'].includes(item.bucket))).toBe(true)
    const list = (await api('/api/due?station=Harlow%20Moor', { cookie: cookies.technician })).body
    expect(work.due.count).toBe(list.counts.overdue + list.counts['this-week'])
    expect((await api('/api/me/work', { cookie: cookies.engineer })).body.due).toBeUndefined()
  })
})
