/**
 * Registers that round-trip through a spreadsheet: the unchanged export imports back as no change at all;
 * an edited one changes exactly the edited cells (previewed first, nothing written by the preview), adds the
 * new rows, and the audit trail names each change. What an import may not change says why, per line.
 */
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { baseURL } from '../support/file-server'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const role of ['admin', 'engineer'] as const) cookies[role] = await signIn(DEMO[role])
})

async function exported(register: string, cookie = cookies.admin!): Promise<string> {
  const response = await fetch(`${baseURL()}/api/${register}/export`, { headers: { cookie } })
  expect(response.status).toBe(200)
  return response.text()
}

async function imported(register: string, csv: string, preview: boolean, cookie = cookies.admin!) {
  const response = await fetch(`${baseURL()}/api/${register}/import${preview ? '?preview=true' : ''}`, {
    method: 'POST',
    headers: { 'content-type': 'text/csv', cookie },
    body: csv,
  })
  return { status: response.status, body: await response.json() }
}

/** The CSV with one cell changed, in the row whose `key` column is `value`. */
function edited(csv: string, key: string, value: string, column: string, to: string): string {
  const { data, meta } = Papa.parse<Record<string, string>>(csv.trim(), { header: true })
  const row = data.find(candidate => candidate[key] === value)
  expect(row, `${key} ${value}`).toBeTruthy()
  row![column] = to
  return Papa.unparse(data, { columns: meta.fields, newline: '\r\n' })
}

describe('a register round-trips through a spreadsheet', () => {
  it.each([
    ['aircraft', 'admin'],
    ['accumulators', 'admin'],
    ['tools', 'admin'],
    ['specifications', 'engineer'],
  ] as const)('the unchanged export of %s imports back as no change', async (register, role) => {
    const csv = await exported(register, cookies[role])
    const rows = Papa.parse(csv.trim(), { header: true }).data.length
    const preview = await imported(register, csv, true, cookies[role])
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({ preview: true, added: 0, updated: 0, unchanged: rows, rejected: [] })
    const applied = await imported(register, csv, false, cookies[role])
    expect(applied.status).toBe(200)
    expect(applied.body).toMatchObject({ imported: 0, added: 0, updated: 0, unchanged: rows })
  })

  it('an edited calibration date changes that cell only: previewed first, then applied and audited', async () => {
    const before = await exported('tools')
    const changed = edited(before, 'assetNumber', 'GA-0141', 'calibrationDue', '2031-06-30')
    const preview = await imported('tools', changed, true)
    expect(preview.body.updated).toBe(1)
    expect(preview.body.added).toBe(0)
    const [change] = preview.body.changes.filter((row: { action: string }) => row.action === 'updated')
    expect(change.key).toBe('GA-0141')
    expect(Object.keys(change.changes)).toEqual(['calibrationDue'])
    expect(change.changes.calibrationDue.to).toBe('2031-06-30')
    // The preview wrote nothing.
    expect(await exported('tools')).toBe(before)

    const applied = await imported('tools', changed, false)
    expect(applied.body).toMatchObject({ imported: 1, updated: 1, added: 0 })
    // The register is now the edited file, cell for cell.
    expect((await exported('tools')).trim()).toBe(changed.trim())
    const audit = (await api('/api/audit/events?entity=tool&pageSize=200', { cookie: cookies.admin })).body
    expect(JSON.stringify(audit)).toMatch(/changed calibrationDue from \\"[\d-]+\\" to \\"2031-06-30\\" of tool \d+ by CSV import/)
  })

  it('aircraft: a new row is added and an edited base moves the aircraft, in one import', async () => {
    const csv = edited(await exported('aircraft'), 'registration', 'QX-FMA', 'base', 'Skelby')
    const withNew = `${csv.trim()}\r\nQX-FRT,791,Tarnwing 46,Harlow Moor,Corran Isles Airways,true\r\n`
    const preview = await imported('aircraft', withNew, true)
    expect(preview.body).toMatchObject({ added: 1, updated: 1, rejected: [] })
    const moved = preview.body.changes.find((row: { key: string }) => row.key === 'QX-FMA')
    expect(moved.changes).toEqual({ base: { from: 'Harlow Moor', to: 'Skelby' } })
    expect((await imported('aircraft', withNew, false)).body).toMatchObject({ imported: 2 })
    const fleet = (await api('/api/aircraft?pageSize=100', { cookie: cookies.admin })).body.items as { registration: string, base: string, operator: string }[]
    expect(fleet.find(aircraft => aircraft.registration === 'QX-FMA')!.base).toBe('Skelby')
    expect(fleet.find(aircraft => aircraft.registration === 'QX-FRT')!.operator).toBe('Corran Isles Airways')
  })

  it('a unit is not moved by a cell, nor an issued specification revision changed: each says why, nothing is written', async () => {
    const units = await exported('accumulators')
    const first = Papa.parse<Record<string, string>>(units.trim(), { header: true }).data.find(row => row.registration)!
    const moved = edited(units, 'serialNumber', first.serialNumber!, 'position', 'Somewhere else')
    const refused = await imported('accumulators', moved, false)
    expect(refused.status).toBe(422)
    expect(JSON.stringify(refused.body.data.rejected)).toMatch(/move it on its page/)

    const specifications = await exported('specifications', cookies.engineer)
    const spec = Papa.parse<Record<string, string>>(specifications.trim(), { header: true }).data[0]!
    const retitled = edited(specifications, 'revision', spec.revision!, 'title', `${spec.title} (edited)`)
    const answer = await imported('specifications', retitled, false, cookies.engineer)
    expect(answer.status).toBe(422)
    expect(answer.body.data.rejected).toEqual(expect.arrayContaining([
      expect.objectContaining({ field: 'title', message: expect.stringMatching(/is issued and does not change/) }),
    ]))
    expect(await exported('specifications', cookies.engineer)).toBe(specifications)
  })
})
