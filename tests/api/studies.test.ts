import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { baseURL } from '../support/file-server'
import { api, DEMO, signIn } from '../support/api'

const psia = (value: number) => ({ value, unit: 'psi', basis: 'absolute' })
/**
 * From memory: the fluid-power textbook example of the engine tests (1 L at 1000 psia, 3000→2000 psia; Boyle
 * gives 1/6 L usable).
 */
const textbook = {
  name: 'Textbook check, ideal isothermal',
  accumulatorType: 'piston',
  gasVolume: { value: 1, unit: 'L' },
  precharge: psia(1000),
  prechargeTemperature: { value: 20, unit: 'C' },
  maxPressure: psia(3000),
  minPressure: psia(2000),
  perApplication: { value: 0.02, unit: 'L' },
  charge: 'isothermal',
  discharge: 'isothermal',
  model: 'ideal',
  envelope: [{ label: 'Standard day', temperature: { value: 20, unit: 'C' } }],
  inverse: { applications: 12 },
}
const brake = {
  name: 'Tarnwing 46 normal brake, cold soak',
  accumulatorType: 'bladder',
  gasVolume: { value: 60, unit: 'in3' },
  precharge: { value: 1000, unit: 'psi', basis: 'gauge' },
  prechargeTemperature: { value: 21, unit: 'C' },
  maxPressure: { value: 3000, unit: 'psi', basis: 'gauge' },
  minPressure: { value: 1500, unit: 'psi', basis: 'gauge' },
  perApplication: { value: 2.5, unit: 'in3' },
  envelope: [
    { label: 'Cold soak', temperature: { value: -40, unit: 'C' } },
    { label: 'Standard day', temperature: { value: 15, unit: 'C' } },
    { label: 'Hot day', temperature: { value: 50, unit: 'C' } },
  ],
}

let engineer: string
let technician: string
beforeAll(async () => {
  engineer = await signIn(DEMO.engineer)
  technician = await signIn(DEMO.technician)
})

describe('sizing studies', () => {
  it('match the textbook values (Boyle: 1/6 L usable, 8 applications of 0.02 L, 1.44 L of gas for 12)', async () => {
    const answer = await api('/api/calc/study', { cookie: technician, body: textbook })
    expect(answer.status).toBe(200)
    const row = answer.body.rows[0]
    expect(row.result.usableVolume.value).toBeCloseTo(1 / 6, 9)
    expect(row.result.applications).toBe(8)
    // 12 × 0.02 L = 0.24 L needed; usable is 1/6 of the gas volume, so 1.44 L of gas.
    expect(row.required.gasVolume.value).toBeCloseTo(1.44, 9)
    expect(row.sweep.optimum.precharge.value).toBeCloseTo(2000, 2)
    expect(row.curve.applications).toHaveLength(8)
  })

  it('an engineer saves, lists, reopens, edits and duplicates a study; the cold day gives fewer applications', async () => {
    const created = await api('/api/studies', { cookie: engineer, body: { ...brake, specificationId: 2 } })
    expect(created.status).toBe(201)
    const [cold, standard, hot] = created.body.results.rows
    expect(cold.result.applications).toBeLessThan(standard.result.applications)
    expect(hot.result.applications).toBeGreaterThanOrEqual(standard.result.applications)
    expect(
      created.body.results.rows.every((row: { result: { warnings: string[] } }) => Array.isArray(row.result.warnings)),
    ).toBe(true)

    const list = await api('/api/studies?q=cold soak', { cookie: engineer })
    expect(list.body.items.map((item: { id: number }) => item.id)).toContain(created.body.id)
    expect((await api(`/api/studies/${created.body.id}`, { cookie: engineer })).body.inputs.name).toBe(brake.name)
    // Sizing is engineering's work (shared/abilities.ts: study.read).
    expect((await api(`/api/studies/${created.body.id}`, { cookie: technician })).status).toBe(403)

    const edited = await api(`/api/studies/${created.body.id}`, {
      method: 'PATCH',
      cookie: engineer,
      body: { ...brake, perApplication: { value: 1, unit: 'in3' } },
    })
    expect(edited.body.results.rows[0].result.applications).toBeGreaterThan(cold.result.applications)

    const copy = await api(`/api/studies/${created.body.id}/duplicate`, { method: 'POST', cookie: engineer })
    expect(copy.status).toBe(201)
    expect(copy.body.name).toBe(`${brake.name} (copy)`)
  })

  it('exports a study as CSV and as a PDF report', async () => {
    const created = await api('/api/studies', { cookie: engineer, body: brake })
    const csv = await fetch(`${baseURL()}/api/studies/${created.body.id}/csv`, { headers: { cookie: engineer } })
    const lines = (await csv.text()).trim().split(/\r?\n/)
    expect(lines[0]).toMatch(/^Condition,Temperature,Temperature unit,Pre-charge at temperature,Pressure unit/)
    expect(lines).toHaveLength(4)
    const pdf = await fetch(`${baseURL()}/api/studies/${created.body.id}/pdf`, { headers: { cookie: engineer } })
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-study-')), 'study.pdf')
    writeFileSync(file, Buffer.from(await pdf.arrayBuffer()))
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' })
    expect(text).toContain('Cold soak')
    expect(text).toMatch(/Applications: \d+/)
  })

  it('only engineers and admins edit; bad input names the field; impossible limits are 422', async () => {
    expect((await api('/api/studies', { cookie: technician, body: {} })).status).toBe(403)
    const empty = await api('/api/studies', { cookie: engineer, body: {} })
    expect(empty.status).toBe(400)
    expect(empty.body.data.issues.map((issue: { field: string }) => issue.field)).toContain('gasVolume')
    const impossible = await api('/api/studies', {
      cookie: engineer,
      body: { ...brake, minPressure: { value: 3500, unit: 'psi', basis: 'gauge' } },
    })
    expect(impossible.status).toBe(422)
    expect(impossible.body.data.field).toBe('minPressure')
    const noSpec = await api('/api/studies', { cookie: engineer, body: { ...brake, specificationId: 9999 } })
    expect(noSpec.status).toBe(422)
  })

  it('a temperature outside the model\'s range is reported on its row, not as a failure', async () => {
    const answer = await api('/api/calc/study', {
      cookie: engineer,
      body: { ...brake, envelope: [...brake.envelope, { label: 'Too cold', temperature: { value: -90, unit: 'C' } }] },
    })
    expect(answer.status).toBe(200)
    expect(answer.body.rows[3].error).toMatch(/outside the real-gas range/)
  })
})
