import { createPinia, setActivePinia } from 'pinia'
import { clear, get } from 'idb-keyval'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { WorksheetStepBody } from '#shared/schemas/worksheet'
import type { Role } from '#shared/types/user'
import { useConnectionStore } from '~~/stores/connection'
import { useDeviceQueueStore } from '~~/stores/device-queue'
import { useFieldReferenceStore } from '~~/stores/field-reference'
import { AIRCRAFT, CART, GAUGE, SPECIFICATION, STEPS_TO_AS_FOUND, UNIT } from '../support/worksheet-fixtures'
import { fakeServer, refusal, until } from './fake-server'

/**
 * The device's queue (stores/device-queue.ts) inside the Nuxt runtime, against a fake server and a fake
 * IndexedDB: steps saved with no signal are kept with the device's time and sent in order when the
 * connection returns; a refusal is kept with its reason; a shared tablet keeps each technician's work apart;
 * a reload loses nothing; a worksheet started offline runs the shared step rules on the device.
 */

const TECHNICIAN = { id: 1, name: 'Ana Vell', email: 'ana@example.test', roles: ['technician'] as Role[] }
const OTHER = { id: 2, name: 'Jo Marr', email: 'jo@example.test', roles: ['technician'] as Role[] }

function signIn(user: typeof TECHNICIAN) {
  useState('nuxt-session').value = { user, loggedInAt: new Date().toISOString() }
}

const preparation: WorksheetStepBody = { step: 'preparation', systemDepressurised: true, aircraftSafe: true }
const tools: WorksheetStepBody = { step: 'tools', gaugeId: 11, cartId: 12 }
const conditions = STEPS_TO_AS_FOUND[2]!

/** A fresh page load: a new Pinia, the store read back from IndexedDB. */
async function openQueue() {
  setActivePinia(createPinia())
  const queue = useDeviceQueueStore()
  await until(() => expect(queue.loaded).toBe(true))
  return queue
}

let server: ReturnType<typeof fakeServer>

beforeEach(async () => {
  server = fakeServer()
  server.on('GET /api/field/reference', () => ({
    station: 'EKR', units: [], specifications: [], tools: [], timeZone: 'UTC', fetchedAt: new Date().toISOString(),
  }))
  await clear()
  signIn(TECHNICIAN)
})

describe('the device queue', () => {
  it('keeps a step saved with no answer, with the technician and the device’s time; one entry per step', async () => {
    const queue = await openQueue()
    server.network.up = false
    expect(await queue.saveStep(41, preparation)).toEqual({ queued: true })
    await queue.saveStep(41, tools)
    await queue.saveStep(41, { ...preparation, eyeProtection: true })
    expect(queue.ownPending.map(entry => entry.body)).toEqual([tools, { ...preparation, eyeProtection: true }])
    expect(queue.ownPending.every(entry => entry.userId === 1 && !Number.isNaN(Date.parse(entry.queuedAt)))).toBe(true)
    expect(queue.waiting).toEqual({ steps: 2, worksheets: 0 })
    expect(server.sent.filter(request => request.url.startsWith('/api/worksheets'))).toEqual([])
  })

  it('answers a refusal as the server gave it, and queues nothing', async () => {
    const queue = await openQueue()
    server.on('PATCH /api/worksheets/41', () => {
      throw refusal(409, 'This worksheet is signed and can no longer change.')
    })
    await expect(queue.saveStep(41, preparation)).rejects.toMatchObject({ statusCode: 409 })
    expect(queue.ownPending).toEqual([])
  })

  it('sends what waits in order when the connection returns, each step with the time it was taken', async () => {
    const queue = await openQueue()
    const connection = useConnectionStore()
    server.network.up = false
    // The heartbeat finds no server (in the app, any request with no answer marks it so at once).
    expect(await connection.check()).toBe(false)
    await queue.saveStep(41, preparation)
    await queue.saveStep(41, tools)
    await queue.saveStep(42, conditions)
    const taken = queue.ownPending.map(entry => entry.queuedAt)
    server.on('PATCH /api/worksheets/41', () => ({ id: 41 }))
    server.on('PATCH /api/worksheets/42', () => ({ id: 42 }))
    server.network.up = true
    // Nobody presses anything: the heartbeat finds the server, and the queue sends itself.
    expect(await connection.check()).toBe(true)
    await until(() => expect(queue.ownPending).toEqual([]))
    const patches = server.sent.filter(request => request.method === 'PATCH')
    expect(patches.map(request => [request.url, (request.body as WorksheetStepBody).step, request.headers['x-taken-at']]))
      .toEqual([
        ['/api/worksheets/41', 'preparation', taken[0]],
        ['/api/worksheets/41', 'tools', taken[1]],
        ['/api/worksheets/42', 'conditions', taken[2]],
      ])
  })

  it('keeps a step the server refused, with the server’s reason, until the technician has read it', async () => {
    const queue = await openQueue()
    server.network.up = false
    await queue.saveStep(41, tools)
    await queue.saveStep(41, conditions)
    server.network.up = true
    server.on('PATCH /api/worksheets/41', ({ body }) => {
      if ((body as WorksheetStepBody).step === 'tools')
        throw refusal(422, 'Gauge GA-0141: calibration expired on 3 Dec 2026. Use another one and quarantine this one.')
      return { id: 41 }
    })
    await queue.flush()
    expect(queue.ownPending).toEqual([])
    expect(queue.ownRefused).toHaveLength(1)
    expect(queue.ownRefused[0]).toMatchObject({ worksheetId: 41, body: tools, reason: expect.stringMatching(/^Gauge GA-0141: calibration expired/) })
    // The step after it was still sent.
    expect(server.sent.filter(request => request.method === 'PATCH')).toHaveLength(2)
    queue.acknowledgeRefused(queue.ownRefused[0]!)
    expect(queue.ownRefused).toEqual([])
  })

  it('stops sending when the connection drops mid-way, and keeps the rest in order', async () => {
    const queue = await openQueue()
    server.network.up = false
    await queue.saveStep(41, preparation)
    await queue.saveStep(41, tools)
    await queue.saveStep(41, conditions)
    server.network.up = true
    server.on('PATCH /api/worksheets/41', ({ body }) => {
      if ((body as WorksheetStepBody).step === 'preparation') server.network.up = false
      return { id: 41 }
    })
    await queue.flush()
    expect(queue.ownPending.map(entry => entry.body.step)).toEqual(['tools', 'conditions'])
    expect(queue.ownRefused).toEqual([])
  })

  it('on a shared tablet, counts and sends only the signed-in technician’s own work', async () => {
    const queue = await openQueue()
    server.network.up = false
    await queue.saveStep(41, preparation)
    signIn(OTHER)
    await queue.saveStep(42, tools)
    expect(queue.ownPending.map(entry => entry.worksheetId)).toEqual([42])
    expect(queue.waiting.steps).toBe(1)
    server.network.up = true
    server.on('PATCH /api/worksheets/42', () => ({ id: 42 }))
    await queue.flush()
    expect(server.sent.filter(request => request.method === 'PATCH').map(request => request.url)).toEqual(['/api/worksheets/42'])
    // The first technician's step is still on the device, for when they sign in again.
    expect(queue.state.pending.map(entry => [entry.userId, entry.worksheetId])).toEqual([[1, 41]])
  })

  it('loses nothing on a reload: what is queued and what is typed are read back from IndexedDB', async () => {
    const queue = await openQueue()
    server.network.up = false
    await queue.saveStep(41, tools)
    queue.remember(41, 'asFound', { reading: { value: 1450, unit: 'psi', basis: 'gauge' } })
    await until(async () => expect((await get('chargewell:field-work'))?.pending).toHaveLength(1))
    await until(async () => expect((await get('chargewell:field-work'))?.values?.[41]).toBeDefined())
    const reloaded = await openQueue()
    expect(reloaded.ownPending.map(entry => entry.body)).toEqual([tools])
    expect(reloaded.draftFor(41, 'asFound')).toEqual({ reading: { value: 1450, unit: 'psi', basis: 'gauge' } })
  })
})

describe('a worksheet started with no signal', () => {
  const unit = { ...UNIT, system: 'Hydraulic system A', installedAt: null, aircraft: { ...AIRCRAFT, base: 'EKR' }, specificationId: SPECIFICATION.id, alerts: [] }

  async function withReference(today: string) {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(new Date(`${today}T09:00:00Z`))
    server.on('GET /api/field/reference', () => ({
      station: 'EKR', units: [unit], specifications: [SPECIFICATION], tools: [GAUGE, CART], timeZone: 'UTC', fetchedAt: new Date().toISOString(),
    }))
    const queue = await openQueue()
    const reference = useFieldReferenceStore()
    await until(() => expect(reference.reference?.tools).toHaveLength(2))
    return queue
  }

  it('runs each step by the shared rules with the device’s tool register, and refuses as the server would', async () => {
    try {
      const queue = await withReference('2027-01-02')
      server.network.up = false
      const clientId = queue.startLocal(unit, SPECIFICATION, { accumulatorId: UNIT.id, workOrder: 'WO-88120', reason: 'scheduled' })
      expect(queue.waiting.worksheets).toBe(1)
      await queue.saveStep(clientId, STEPS_TO_AS_FOUND[0]!)
      // GA-0141 was due on 31 Dec 2026: on 2 Jan 2027 the device refuses it, shaped like the server's 422 on gaugeId.
      await expect(queue.saveStep(clientId, tools)).rejects.toMatchObject({
        statusCode: 422,
        data: { data: { issues: [{ field: 'gaugeId', message: expect.stringMatching(/calibration expired/) }] } },
      })
      expect(queue.localView(clientId)!.content.tools).toBeUndefined()
      expect(queue.state.local[clientId]!.steps.map(entry => entry.body.step)).toEqual(['preparation'])
    }
    finally {
      vi.useRealTimers()
    }
  })

  it('is sent whole when the connection returns, without the figures the device computed, and leaves the device', async () => {
    try {
      const queue = await withReference('2026-12-04')
      server.network.up = false
      const clientId = queue.startLocal(unit, SPECIFICATION, { accumulatorId: UNIT.id, workOrder: 'WO-88121', reason: 'scheduled' })
      for (const step of [...STEPS_TO_AS_FOUND, { step: 'asFound', reading: { value: 1450, unit: 'psi', basis: 'gauge' } } as const])
        await queue.saveStep(clientId, step)
      expect(queue.localView(clientId)!.results.asFound!.assessment.verdict).toBe('in-limits')
      server.network.up = true
      server.on('POST /api/worksheets/sync', () => ({ worksheet: { id: 77 }, conflicts: [] }))
      const sent = await queue.flush()
      const body = server.sent.find(request => request.url === '/api/worksheets/sync')!.body as Record<string, unknown>
      expect(body).toMatchObject({ clientId, accumulatorId: UNIT.id, specificationId: SPECIFICATION.id, workOrder: 'WO-88121' })
      expect((body.steps as { body: WorksheetStepBody }[]).map(entry => entry.body.step))
        .toEqual(['preparation', 'tools', 'conditions', 'asFound'])
      // The server recomputes every figure: the device's own are never sent as the record.
      expect(body).not.toHaveProperty('results')
      expect(body).not.toHaveProperty('content')
      expect(body).not.toHaveProperty('performer')
      expect(sent).toEqual([expect.objectContaining({ clientId, worksheetId: 77, label: 'QX-FMA · Main hydraulic, left wheel well · WO-88121' })])
      expect(queue.state.local).toEqual({})
      expect(queue.waiting).toEqual({ steps: 0, worksheets: 0 })
    }
    finally {
      vi.useRealTimers()
    }
  })
})
