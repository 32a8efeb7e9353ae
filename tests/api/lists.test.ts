/**
 * The worksheet list at any size: pages by cursor that cover every match exactly once in
 * order, forwards and back; prefix search on work order, registration, serial and part
 * number in any case; unknown parameters refused; the export has every row.
 */
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { sqliteDateText } from '../../server/utils/stored-date'
import { sql } from '../support/database'
import { baseURL, fileDatabase } from '../support/file-server'

let cookie: string
beforeAll(async () => {
  cookie = await signIn(DEMO.engineer)
})

async function walk(query: string, toward: 'next' | 'previous', start?: string) {
  const ids: number[] = []
  let cursor = start
  let pages = 0
  let last
  do {
    last = (await api(`/api/worksheets?${query}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ''}`, { cookie }))
      .body
    ids.push(...(toward === 'next' ? last.items : [...last.items].reverse()).map((item: { id: number }) => item.id))
    cursor = last[toward]
    pages++
  } while (cursor && pages < 100)
  return { ids, last }
}

describe('pages by cursor', () => {
  it.each([
    ['createdAt', 'desc'],
    ['performedAt', 'asc'],
    ['workOrder', 'asc'],
    ['state', 'desc'],
  ])('sorted by %s %s, every worksheet once, in order, and back again', async (sort, direction) => {
    const all = (await api(`/api/worksheets?sort=${sort}&direction=${direction}&pageSize=200`, { cookie })).body
    expect(all.total).toBeGreaterThan(120)
    const forwards = await walk(`sort=${sort}&direction=${direction}&pageSize=7`, 'next')
    expect(forwards.ids).toEqual(all.items.map((item: { id: number }) => item.id))
    // From the last page, previous pages lead back to the first.
    const lastPage = forwards.last
    const backwards = await walk(`sort=${sort}&direction=${direction}&pageSize=7`, 'previous', lastPage.previous)
    expect([...backwards.ids].reverse()).toEqual(forwards.ids.slice(0, forwards.ids.length - lastPage.items.length))
  })

  it('reads only the list columns: no JSON content in a row', async () => {
    const page = (await api('/api/worksheets?pageSize=3', { cookie })).body
    expect(Object.keys(page.items[0]).sort()).toEqual([
      'asFoundVerdict',
      'asLeftVerdict',
      'correctsId',
      'createdAt',
      'fleetNumber',
      'id',
      'partNumber',
      'performedAt',
      'performer',
      'performerId',
      'position',
      'reason',
      'registration',
      'releasedAt',
      'serialNumber',
      'state',
      'workOrder',
    ])
  })

  it('refuses an unknown parameter, a page number and a tampered cursor, naming the field', async () => {
    for (const [query, field] of [
      ['page=2', 'page'],
      ['sort=workOrder&colour=red', 'colour'],
      ['cursor=bm90LWEtY3Vyc29y', 'cursor'],
    ]) {
      const answer = await api(`/api/worksheets?${query}`, { cookie })
      expect(answer.status, query).toBe(400)
      expect(answer.body.data.issues.map((issue: { field: string }) => issue.field)).toContain(field)
    }
  })
})

interface Sample {
  id: number
  workOrder: string
  registration: string
  serialNumber: string
  partNumber: string
}

describe('search', () => {
  it.each([
    ['a work order prefix', (row: Sample) => row.workOrder.slice(0, 9)],
    ['a registration, lower case', (row: Sample) => row.registration.toLowerCase()],
    ['a serial number', (row: Sample) => row.serialNumber],
    ['a part number prefix, lower case', (row: Sample) => row.partNumber.slice(0, 6).toLowerCase()],
  ])('finds by %s', async (_what, term) => {
    const sample = (await api('/api/worksheets?pageSize=1&state=released', { cookie })).body.items[0]
    const q = term(sample)
    const found = (await api(`/api/worksheets?q=${encodeURIComponent(q)}&pageSize=200`, { cookie })).body
    expect(found.items.map((item: { id: number }) => item.id)).toContain(sample.id)
    const lower = q.toLowerCase()
    for (const item of found.items) {
      expect(
        [item.workOrder, item.registration, item.serialNumber, item.partNumber].some((value: string) =>
          value.toLowerCase().startsWith(lower),
        ),
      ).toBe(true)
    }
  })

  it('a dense search whose matches all lie at the far end of the list pages them all, in order, and back', async () => {
    // 600 copies of a released worksheet dated ten years back: more than the 500 that make a search "dense".
    await insertCopies(600, number => `WO-DENSE-${String(number).padStart(3, '0')}`, Date.UTC(2016, 0, 1), 3_600_000)
    const query = 'q=wo-dense&sort=createdAt&direction=desc&pageSize=25'
    const firstPage = (await api(`/api/worksheets?${query}`, { cookie })).body
    expect(firstPage.total).toBe(600)
    expect(firstPage.items[0].workOrder).toBe('WO-DENSE-599')
    const forwards = await walk(query, 'next')
    expect(forwards.ids).toHaveLength(600)
    expect(new Set(forwards.ids).size).toBe(600)
    const backwards = await walk(query, 'previous', forwards.last.previous)
    expect([...backwards.ids].reverse()).toEqual(forwards.ids.slice(0, 600 - forwards.last.items.length))
  })

  it('a search of more than 10,000 matches, all at the far end, starts at its first match both ways', async () => {
    // 10,100 copies dated eleven years back: beyond the count's cap, so the first match is read from the
    // search indexes (lower(value), created_at, id) instead of walking the whole list first.
    await insertCopies(10_100, number => `WO-VAST-${String(number).padStart(5, '0')}`, Date.UTC(2015, 0, 1), 60_000)
    const newest = (await api('/api/worksheets?q=wo-vast&sort=createdAt&direction=desc&pageSize=25', { cookie })).body
    expect(newest.totalCapped).toBe(true)
    expect(newest.items.map((item: { workOrder: string }) => item.workOrder).slice(0, 3))
      .toEqual(['WO-VAST-10099', 'WO-VAST-10098', 'WO-VAST-10097'])
    const second = (await api(`/api/worksheets?q=wo-vast&sort=createdAt&direction=desc&pageSize=25&cursor=${newest.next}`, { cookie })).body
    expect(second.items[0].workOrder).toBe('WO-VAST-10074')
    const oldest = (await api('/api/worksheets?q=wo-vast&sort=createdAt&direction=asc&pageSize=25', { cookie })).body
    expect(oldest.items[0].workOrder).toBe('WO-VAST-00000')
    // With another filter the search indexes cannot answer alone; the list is still right.
    const released = (await api('/api/worksheets?q=wo-vast&state=released&sort=createdAt&direction=desc&pageSize=5', { cookie })).body
    expect(released.items[0].workOrder).toBe('WO-VAST-10099')
  })

  it('a dense search of few values, its newest match beyond the newest rows, starts at that match both ways', async () => {
    // 2,500 copies twelve years back under 50 work orders, the newest of them not the last value in
    // alphabetical order: on SQLite the first match is found one value at a time in the search index.
    const value = (number: number) => `WO-FEW-${String((number * 7) % 50).padStart(2, '0')}`
    await insertCopies(2500, value, Date.UTC(2014, 0, 1), 3_600_000)
    const query = 'q=wo-few&sort=createdAt&direction=desc&pageSize=100'
    const first = (await api(`/api/worksheets?${query}`, { cookie })).body
    expect(first.total).toBe(2500)
    const newest = first.items.slice(0, 2).map((item: { workOrder: string }) => item.workOrder)
    expect(newest).toEqual([value(2499), value(2498)])
    const forwards = await walk(query, 'next')
    expect(forwards.ids).toHaveLength(2500)
    expect(new Set(forwards.ids).size).toBe(2500)
    const oldest = (await api('/api/worksheets?q=wo-few&sort=createdAt&direction=asc&pageSize=3', { cookie })).body
    expect(oldest.items.map((item: { workOrder: string }) => item.workOrder)).toEqual([value(0), value(1), value(2)])
  })

  it('a dense search starts right when the newest or oldest row under its prefix changed its value', async () => {
    // On SQLite each prefix's newest and oldest row is kept as worksheets are written (migration 0019); a row
    // moved out of the prefix leaves that bound behind (the walk steps over it), and a row moved in widens it.
    await insertCopies(700, number => `WO-KEPT-${String(number).padStart(3, '0')}`, Date.UTC(2012, 0, 1), 3_600_000)
    const query = (direction: string) => `/api/worksheets?q=wo-kept&sort=createdAt&direction=${direction}&pageSize=3`
    const workOrders = (page: { items: { workOrder: string }[] }) => page.items.map(item => item.workOrder)
    expect(workOrders((await api(query('desc'), { cookie })).body)).toEqual(['WO-KEPT-699', 'WO-KEPT-698', 'WO-KEPT-697'])
    for (const moved of ['WO-KEPT-699', 'WO-KEPT-000'])
      await sql(fileDatabase(), 'UPDATE worksheets SET work_order = ? WHERE work_order = ?', [`MOVED-${moved}`, moved])
    const newest = (await api(query('desc'), { cookie })).body
    expect(newest.total).toBe(698)
    expect(workOrders(newest)).toEqual(['WO-KEPT-698', 'WO-KEPT-697', 'WO-KEPT-696'])
    expect(workOrders((await api(query('asc'), { cookie })).body)).toEqual(['WO-KEPT-001', 'WO-KEPT-002', 'WO-KEPT-003'])
    // A newer worksheet given a work order under the prefix comes first.
    const [latest] = await sql<{ id: number }>(fileDatabase(), 'SELECT id FROM worksheets ORDER BY created_at DESC, id DESC LIMIT 1')
    await sql(fileDatabase(), 'UPDATE worksheets SET work_order = ? WHERE id = ?', ['WO-KEPT-LATEST', latest!.id])
    expect(workOrders((await api(query('desc'), { cookie })).body)).toEqual(['WO-KEPT-LATEST', 'WO-KEPT-698', 'WO-KEPT-697'])
  })

  it('counts a row that matches in two columns once', async () => {
    await insertCopies(30, number => `TWIN-${number}`, Date.UTC(2013, 0, 1), 60_000, number => ({ serial_number: `TWIN-${number}` }))
    const found = (await api('/api/worksheets?q=twin-&pageSize=50', { cookie })).body
    expect(found.total).toBe(30)
    expect(found.items).toHaveLength(30)
  })

  it('takes % and _ as themselves', async () => {
    expect((await api('/api/worksheets?q=%25', { cookie })).body.total).toBe(0)
    expect((await api('/api/worksheets?q=_', { cookie })).body.total).toBe(0)
  })
})

/**
 * `count` copies of the first released worksheet, written straight into the database: work order
 * `workOrder(n)`, created `from + n * step` ms (as Sequelize writes a date: SQLite compares them as text),
 * other columns as `more(n)` sets them.
 */
async function insertCopies(
  count: number,
  workOrder: (number: number) => string,
  from: number,
  step: number,
  more: (number: number) => Record<string, unknown> = () => ({}),
) {
  const [template] = await sql<Record<string, unknown>>(fileDatabase(), 'SELECT * FROM worksheets WHERE state = ? ORDER BY id LIMIT 1', ['released'])
  const columns = Object.keys(template!).filter(name => name !== 'id')
  for (let first = 0; first < count; first += 200) {
    const rows = Array.from({ length: Math.min(200, count - first) }, (_, index) => first + index)
    const values = rows.flatMap(number => columns.map((name) => {
      const set = more(number)
      if (name in set) return set[name]
      if (name === 'work_order') return workOrder(number)
      if (name === 'created_at') return sqliteDateText(new Date(from + number * step))
      if (name === 'client_id') return null
      return template![name]
    }))
    await sql(
      fileDatabase(),
      `INSERT INTO worksheets (${columns.join(', ')}) VALUES ${rows.map(() => `(${columns.map(() => '?').join(', ')})`).join(', ')}`,
      values,
    )
  }
}

describe('the export', () => {
  it('streams every matching row, with no cap', async () => {
    // Counted in the database: the list counts at most 10,000, and other tests here add more than that.
    const [counted] = await sql<{ total: number | string }>(fileDatabase(), 'SELECT COUNT(*) AS total FROM worksheets')
    const total = Number(counted!.total)
    const response = await fetch(`${baseURL()}/api/worksheets/export?sort=workOrder&direction=asc`, {
      headers: { cookie },
    })
    const rows = Papa.parse<string[]>(await response.text(), { skipEmptyLines: true }).data
    expect(rows[0]![0]).toBe('Worksheet')
    expect(rows).toHaveLength(total + 1)
    expect(new Set(rows.slice(1).map(row => row[0])).size).toBe(total)
    expect((await fetch(`${baseURL()}/api/worksheets/export?pageSize=3`, { headers: { cookie } })).status).toBe(400)
  })
})
