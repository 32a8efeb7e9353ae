/**
 * The one sender of a device's queue (page and service worker alike): order, a refusal kept with its reason,
 * a stop at the first request that gets no answer, photos of a worksheet started here sent to the record the
 * server made of it, and only the signed-in user's work.
 */
import { describe, expect, it } from 'vitest'
import { EMPTY_DEVICE_QUEUE, type DeviceQueue, type LocalWorksheet } from '../../shared/types/device-queue'
import { sendDeviceQueue, type Sender } from '../../shared/utils/device-send'

const step = (worksheetId: number, userId: number, name: 'tools' | 'asFound') => ({
  worksheetId, userId, queuedAt: '2026-12-04T08:00:00.000Z',
  body: name === 'tools' ? { step: 'tools' as const, gaugeId: 1, cartId: 2 } : { step: 'asFound' as const, reading: { value: 1390, unit: 'psi' as const, basis: 'gauge' as const } },
})

function local(clientId: string, performerId: number): LocalWorksheet {
  return {
    clientId,
    performer: { id: performerId, name: 'R. Example' },
    accumulatorId: 7,
    specificationId: 3,
    workOrder: 'WO-TEST-1',
    reason: 'scheduled',
    startedAt: '2026-12-04T07:00:00.000Z',
    steps: [],
    content: { aircraft: { registration: 'QX-TST' }, accumulator: { position: 'System 1' } } as LocalWorksheet['content'],
    results: {},
  }
}

function recorder(answers: Record<string, (body: unknown) => unknown>) {
  const sent: string[] = []
  const saved: DeviceQueue[] = []
  const dropped: string[] = []
  const answer = (key: string, body: unknown) => {
    sent.push(key)
    const reply = answers[key]
    if (!reply) throw { message: 'Failed to fetch' }
    return reply(body)
  }
  const sender: Sender = {
    json: async <T>(path: string, init: { method: string, body: unknown }) => answer(`${init.method} ${path}`, init.body) as T,
    form: async (path, form) => answer(`FORM ${path} ${form.get('worksheetId')} ${form.get('fileName')}`, form),
    photo: async () => new Blob([new Uint8Array([0x89, 0x50, 0x4E, 0x47])], { type: 'image/png' }),
    dropPhoto: async (key) => {
      dropped.push(key)
    },
    save: (queue) => {
      saved.push(structuredClone(queue))
    },
    now: () => '2026-12-04T09:00:00.000Z',
  }
  return { sender, sent, saved, dropped }
}

const refused = (message: string, more: Record<string, unknown> = {}) => () => {
  throw { statusCode: 422, message, data: { message, data: more } }
}

describe('sending a device\'s queue', () => {
  it('sends the user\'s steps in order with their times; a refusal is kept with the server\'s reason, never dropped', async () => {
    const queue: DeviceQueue = { ...structuredClone(EMPTY_DEVICE_QUEUE), pending: [step(5, 1, 'tools'), step(9, 2, 'tools'), step(5, 1, 'asFound')] }
    const { sender, sent } = recorder({
      'PATCH /api/worksheets/5': body => ((body as { step: string }).step === 'tools'
        ? refused('Gauge GA-0152: calibration expired.', { keptAsObservation: true })()
        : {}),
    })
    await sendDeviceQueue(queue, 1, sender)
    expect(sent).toEqual(['PATCH /api/worksheets/5', 'PATCH /api/worksheets/5'])
    // Another technician's step on a shared tablet waits for their own session.
    expect(queue.pending).toEqual([step(9, 2, 'tools')])
    expect(queue.refused).toHaveLength(1)
    expect(queue.refused[0]!.reason).toMatch(/^Gauge GA-0152: calibration expired\. What you entered is kept on the worksheet as observed/)
  })

  it('stops at the first request with no answer and keeps the rest, in order', async () => {
    const queue: DeviceQueue = { ...structuredClone(EMPTY_DEVICE_QUEUE), pending: [step(5, 1, 'tools'), step(5, 1, 'asFound')] }
    const { sender, sent } = recorder({})
    await sendDeviceQueue(queue, 1, sender)
    expect(sent).toEqual(['PATCH /api/worksheets/5'])
    expect(queue.pending).toHaveLength(2)
    expect(queue.refused).toEqual([])
  })

  it('sends a worksheet started here, then its photo to the record the server made of it, and forgets both', async () => {
    const queue: DeviceQueue = {
      ...structuredClone(EMPTY_DEVICE_QUEUE),
      local: { 'c-1': local('c-1', 1), 'c-2': local('c-2', 2) },
      photos: [{ id: 'p-1', worksheet: 'c-1', userId: 1, name: 'gauge.png', type: 'image/png', takenAt: '2026-12-04T07:30:00.000Z', blobKey: 'chargewell:photo:p-1' }],
    }
    const { sender, sent, dropped } = recorder({
      'POST /api/worksheets/sync': () => ({ worksheet: { id: 41 }, conflicts: [], created: true }),
      'FORM /api/attachments 41 gauge.png': () => ({}),
    })
    const done = await sendDeviceQueue(queue, 1, sender)
    expect(sent).toEqual(['POST /api/worksheets/sync', 'FORM /api/attachments 41 gauge.png'])
    expect(done.map(entry => entry.worksheetId)).toEqual([41])
    expect(Object.keys(queue.local)).toEqual(['c-2'])
    expect(queue.photos).toEqual([])
    expect(dropped).toEqual(['chargewell:photo:p-1'])
    expect(queue.sent[0]).toMatchObject({ clientId: 'c-1', worksheetId: 41, label: 'QX-TST · System 1 · WO-TEST-1' })
  })

  it('a photo of a worksheet still on the device waits for it', async () => {
    const queue: DeviceQueue = {
      ...structuredClone(EMPTY_DEVICE_QUEUE),
      local: { 'c-1': { ...local('c-1', 1), failure: 'The unit is no longer installed.' } },
      photos: [{ id: 'p-1', worksheet: 'c-1', userId: 1, name: 'gauge.png', type: 'image/png', takenAt: '2026-12-04T07:30:00.000Z', blobKey: 'k' }],
    }
    const { sender, sent } = recorder({})
    await sendDeviceQueue(queue, 1, sender)
    expect(sent).toEqual([])
    expect(queue.photos).toHaveLength(1)
  })
})
