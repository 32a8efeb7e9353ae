/**
 * Property-based fuzz (fast-check) of every POST and PATCH route and every list query, signed
 * in with a role the route lets through: random JSON, broken JSON, numbers JSON should not carry
 * (1e999), valid bodies with one field replaced, deleted or added, junk ids and junk query
 * values. Whatever arrives, the answer is below 500, and the server is healthy and its audit
 * chain intact afterwards.
 */
import fc from 'fast-check'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { rolesFor } from '../../shared/abilities'
import { ROLES } from '../../shared/types/user'
import { ROUTE_ACCESS } from './route-access'

const RUNS_PER_ROUTE = 100
const psig = (value: number) => ({ value, unit: 'psi', basis: 'gauge' })
const celsius = (value: number) => ({ value, unit: 'C' })
const sizing = {
  gasVolume: { value: 60, unit: 'in3' },
  precharge: psig(1000),
  prechargeTemperature: celsius(21),
  maxPressure: psig(3000),
  minPressure: psig(1500),
  perApplication: { value: 4, unit: 'in3' },
}
const study = {
  name: 'Fuzz',
  accumulatorType: 'bladder',
  ...sizing,
  charge: 'isothermal',
  discharge: 'adiabatic',
  model: 'real',
  envelope: [{ label: 'Cold', temperature: celsius(-30) }],
}
const specification = {
  partNumber: 'FZ-1',
  revision: 'A',
  title: 'Fuzz accumulator',
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
  dataReference: 'FZ SMM',
  dataRevision: 'Rev 1',
}

/** A valid body per route, for mutation; routes without one get random bodies only. */
const SAMPLES: Record<string, unknown> = {
  'POST /api/calc/charge-target': {
    reference: { pressure: psig(1000), temperature: celsius(21) },
    gasTemperature: celsius(0),
    tolerance: { minus: 50, plus: 50, unit: 'psi' },
    ambient: { elevation: { value: 420, unit: 'ft' } },
  },
  'POST /api/calc/usable-volume': sizing,
  'POST /api/calc/required-volume': { ...sizing, gasVolume: undefined, applications: 6 },
  'POST /api/calc/leak-rate': {
    gasVolume: { value: 120, unit: 'in3' },
    precharge: psig(1500),
    prechargeTemperature: celsius(21),
    temperature: celsius(35),
    cutOut: psig(3000),
    cutIn: psig(2600),
    interval: { value: 7, unit: 'min' },
  },
  'POST /api/calc/settle-forecast': {
    readings: [
      { minutesAfter: 0, pressure: psig(1100) },
      { minutesAfter: 5, pressure: psig(1070) },
      { minutesAfter: 10, pressure: psig(1055) },
    ],
    readingUncertainty: 2,
    band: { low: psig(975), high: psig(1075) },
  },
  'POST /api/calc/study': study,
  'POST /api/studies': study,
  'PATCH /api/studies/[id]': study,
  'POST /api/specifications': specification,
  'PATCH /api/specifications/[id]': { referencePressure: 1550, revision: 'Z', dataRevision: 'Rev 99' },
  'POST /api/tools': {
    kind: 'gauge',
    assetNumber: 'GA-FZ',
    description: 'Fuzz gauge',
    rangeMax: 5000,
    rangeUnit: 'psi',
    accuracy: 0.25,
    accuracyUnit: '%FS',
    calibrationDue: '2027-01-01',
  },
  'PATCH /api/tools/[id]': { rangeMax: 4000, accuracy: 0.5 },
  'POST /api/aircraft': { registration: 'QX-FZA', fleetNumber: '999', type: 'Tarnwing 46', base: 'Skelby' },
  'PATCH /api/aircraft/[id]': { base: 'Skelby' },
  'POST /api/accumulators': {
    partNumber: 'FA-2210-03',
    serialNumber: 'SN-FZ',
    system: 'Hydraulic system A',
    aircraftId: null,
  },
  'PATCH /api/accumulators/[id]': { system: 'Hydraulic system A' },
  'POST /api/worksheets': { accumulatorId: 1, workOrder: 'WO-FUZZ', reason: 'scheduled' },
  'PATCH /api/worksheets/[id]': {
    step: 'conditions',
    gasTemperature: celsius(12),
    temperatureMethod: 'shell',
    minutesSinceOperated: 60,
    ambient: { elevation: { value: 420, unit: 'ft' } },
  },
  'POST /api/worksheets/[id]/sign': { password: 'not-the-password', certify: true },
  'POST /api/worksheets/[id]/countersign': { password: 'not-the-password', certify: true },
  'POST /api/worksheets/[id]/return': { reason: 'Fuzzing the reason field.' },
  'POST /api/worksheets/[id]/void': { reason: 'Fuzzing the reason field.' },
  'POST /api/cycle-checks': {
    aircraftId: 4,
    system: 'Hydraulic system 1',
    cutOut: psig(3000),
    cutIn: psig(2600),
    interval: { value: 400, unit: 's' },
    fluidTemperature: celsius(40),
  },
  'PATCH /api/cycle-checks/[id]': {
    aircraftId: 4,
    system: 'Hydraulic system 1',
    cutOut: psig(3000),
    cutIn: psig(2600),
    interval: { value: 410, unit: 's' },
    fluidTemperature: celsius(40),
  },
  'POST /api/cycle-checks/[id]/withdraw': { reason: 'Fuzzing the reason field.' },
  'POST /api/worksheets/[id]/discard': { reason: 'Fuzzing the reason field.' },
  'PATCH /api/me/preferences': {
    pressureUnit: 'bar',
    temperatureUnit: 'C',
    volumeUnit: 'L',
    stationElevation: { value: 100, unit: 'm' },
    stationName: 'Skelby',
  },
  'POST /api/admin/users': {
    email: 'fuzz@chargewell.test',
    name: 'Fuzz Person',
    roles: ['engineer'],
    password: 'a-long-enough-password',
  },
  'PATCH /api/admin/users/[id]': { name: 'Sol Varga' },
  'POST /api/auth/login': { email: 'nobody@chargewell.test', password: 'wrong' },
}

const QUERY_KEYS = [
  'page',
  'pageSize',
  'sort',
  'direction',
  'q',
  'state',
  'from',
  'to',
  'aircraftId',
  'accumulatorId',
  'performerId',
  'toolId',
  'type',
  'base',
  'kind',
  'calibration',
  'active',
  'installed',
  'status',
  'partNumber',
  'flagged',
  'system',
  'position',
  'specificationId',
  'extra',
]
const junkScalar = fc.oneof(
  fc.constantFrom(
    '1e20',
    '1e999',
    '-1e999',
    '-1',
    '0',
    'NaN',
    'Infinity',
    '1.5',
    '[]',
    '{}',
    '%00',
    'asc',
    'desc',
    'released',
    'true',
    '2026-02-30',
    '9007199254740993',
    '',
  ),
  fc.string({ maxLength: 40 }),
  fc.integer().map(String),
)
const junkId = fc.oneof(
  { weight: 4, arbitrary: fc.constant('') },
  { weight: 1, arbitrary: fc.constantFrom('0', '-1', 'abc', '1e20', '99999999999', '1.5', '%20', 'NaN') },
)

/** One JSON value replaced, removed or added somewhere in a sample. */
function mutate(sample: unknown) {
  return fc
    .tuple(
      fc.nat(),
      fc.constantFrom('replace', 'delete', 'add'),
      fc.jsonValue({ maxDepth: 3 }),
      fc.string({ maxLength: 12 }),
    )
    .map(([pick, how, value, key]) => {
      const copy = structuredClone(sample) as Record<string, unknown>
      const holders: [Record<string, unknown>, string][] = []
      const walk = (node: unknown) => {
        if (node && typeof node === 'object') {
          for (const [name, child] of Object.entries(node)) {
            holders.push([node as Record<string, unknown>, name])
            walk(child)
          }
        }
      }
      walk(copy)
      if (holders.length === 0) return value
      const [holder, name] = holders[pick % holders.length]!
      if (how === 'replace') holder[name] = value
      else if (how === 'delete') Reflect.deleteProperty(holder, name)
      else holder[key || 'unknownField'] = value
      return copy
    })
}

/**
 * The raw text of a request body: JSON of a value, a sample with 1e999 put in for a number, or text that is not
 * JSON.
 */
function bodies(sample: unknown) {
  const values
    = sample === undefined
      ? fc.jsonValue({ maxDepth: 4 })
      : fc.oneof(fc.jsonValue({ maxDepth: 4 }), mutate(sample), mutate(sample), mutate(sample))
  const asText = values.map(value => JSON.stringify(value) ?? 'null')
  const overflowing
    = sample === undefined
      ? fc.constant('{"value":1e999}')
      : fc
          .tuple(
            fc.nat(),
            fc.constantFrom('1e999', '-1e999', '1e308', '-0', '5e-324', '123456789012345678901234567890'),
          )
          .map(([pick, number]) => {
            const text = JSON.stringify(sample)
            const numbers = [...text.matchAll(/(?<=:)-?\d+(\.\d+)?(?=[,}\]])/g)]
            if (numbers.length === 0) return text
            const chosen = numbers[pick % numbers.length]!
            return text.slice(0, chosen.index) + number + text.slice(chosen.index! + chosen[0].length)
          })
  const broken = fc.constantFrom(
    '{',
    '{"a":',
    'not json',
    '[1,2',
    '"\\ud800"',
    `${'['.repeat(3000)}${']'.repeat(3000)}`,
    '{"__proto__":{"admin":true}}',
    '{"constructor":{"prototype":{}}}',
  )
  return fc.oneof(
    { weight: 5, arbitrary: asText },
    { weight: 2, arbitrary: overflowing },
    { weight: 1, arbitrary: broken },
  )
}

const cookies: Record<string, string> = {}
const ids: Record<string, string> = {}
beforeAll(async () => {
  for (const [role, email] of Object.entries(DEMO)) cookies[role] = await signIn(email)
  const users = (await api('/api/admin/users', { cookie: cookies.admin })).body as { id: number, email: string }[]
  const draft = (await api('/api/worksheets?state=draft&pageSize=5', { cookie: cookies.technician })).body.items[0]
  // Never the fuzzing accounts themselves: a random valid body could disable or re-password them.
  ids.user = String(users.find(user => user.email === DEMO.engineer)!.id)
  ids.worksheet = String(draft.id)
})

/** A role the route lets through; the technician for worksheet work (the seeded draft is theirs). */
function cookieFor(key: string): string | undefined {
  const access = ROUTE_ACCESS[key]!
  if (access === 'public') return undefined
  const holders = rolesFor(access, ROLES)
  if (holders.length === ROLES.length) return cookies.lead
  return cookies[holders.includes('technician') ? 'technician' : holders[0]!]
}

function pathFor(pattern: string, junk: string): string {
  const id = pattern.startsWith('/api/admin/users/')
    ? ids.user
    : pattern.startsWith('/api/worksheets/')
      ? ids.worksheet
      : '1'
  return pattern.replace(/\[\w+\]/g, junk || id!)
}

const writeRoutes = Object.keys(ROUTE_ACCESS).filter(
  key =>
    /^(POST|PATCH) /.test(key)
    && key !== 'POST /api/auth/logout'
    && !key.endsWith('/import')
    && key !== 'POST /api/attachments',
)
const listRoutes = Object.keys(ROUTE_ACCESS).filter(
  key => key.startsWith('GET ') && !key.includes('[') && !/health|\/me$|verify|outbox|audit\/export/.test(key),
)

async function inBatches<T>(items: T[], size: number, work: (item: T) => Promise<void>) {
  for (let start = 0; start < items.length; start += size) await Promise.all(items.slice(start, start + size).map(work))
}

describe('malformed input never gets a 5xx', () => {
  let sent = 0
  const fiveHundreds: string[] = []
  const record = (what: string, status: number, body: string) => {
    sent++
    if (status >= 500) fiveHundreds.push(`${what} → ${status} ${body.slice(0, 300)}`)
    return status < 500
  }

  it(`${writeRoutes.length} write routes × ${RUNS_PER_ROUTE} bodies`, { timeout: 240_000 }, async () => {
    await inBatches(writeRoutes, 4, async (key) => {
      const [method, pattern] = key.split(' ') as [string, string]
      await fc.assert(
        fc.asyncProperty(
          bodies(SAMPLES[key]),
          junkId,
          fc.constantFrom('application/json', 'application/json', 'text/plain', 'application/x-www-form-urlencoded'),
          async (text, junk, type) => {
            const cookie = cookieFor(key)
            const response = await fetch(`${baseURL()}${pathFor(pattern, junk)}`, {
              method,
              headers: { 'content-type': type, ...(cookie ? { cookie } : {}) },
              body: text,
            })
            return record(`${key} ${text.slice(0, 200)}`, response.status, await response.text())
          },
        ),
        { numRuns: RUNS_PER_ROUTE, endOnFailure: true },
      )
    })
    expect(fiveHundreds).toEqual([])
  })

  it(`${listRoutes.length} list and export queries × ${RUNS_PER_ROUTE}`, { timeout: 240_000 }, async () => {
    await inBatches(listRoutes, 4, async (key) => {
      const pattern = key.split(' ')[1]!
      await fc.assert(
        fc.asyncProperty(fc.dictionary(fc.constantFrom(...QUERY_KEYS), junkScalar, { maxKeys: 4 }), async (query) => {
          const search = new URLSearchParams(query).toString()
          const response = await fetch(`${baseURL()}${pattern}?${search}`, { headers: { cookie: cookies.lead! } })
          return record(`${key}?${search}`, response.status, await response.text())
        }),
        { numRuns: RUNS_PER_ROUTE, endOnFailure: true },
      )
    })
    expect(fiveHundreds).toEqual([])
  })

  it('uploads with junk form fields', { timeout: 120_000 }, async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.option(junkScalar),
        fc.option(junkScalar),
        fc.uint8Array({ maxLength: 64 }),
        async (worksheetId, kind, bytes) => {
          const form = new FormData()
          if (worksheetId !== null) form.append('worksheetId', worksheetId)
          if (kind !== null) form.append('kind', kind)
          form.append('file', new Blob([bytes]), 'photo.jpg')
          const response = await fetch(`${baseURL()}/api/attachments`, {
            method: 'POST',
            body: form,
            headers: { cookie: cookies.technician! },
          })
          return record(`upload ${worksheetId} ${kind}`, response.status, await response.text())
        },
      ),
      { numRuns: 200 },
    )
    expect(fiveHundreds).toEqual([])
  })

  it('sent at least 5000 requests, and the server is healthy with its audit chain intact', async () => {
    expect(sent).toBeGreaterThanOrEqual(5000)
    expect((await api('/api/health')).status).toBe(200)
    const chain = await api('/api/audit/verify', { cookie: cookies.admin })
    expect(chain.body).toMatchObject({ ok: true, mismatches: 0, headProblems: [] })
  })
})
