/**
 * Signed webhooks from a durable outbox, against a local receiver: a receiver that fails three times and
 * then recovers gets every event exactly once per endpoint (by its webhook-id), each signature valid, the
 * events about one record in the order they happened; a kill -9 of the server with deliveries pending
 * (some mid-send) loses none of them; deliveries are listed with every attempt and can be replayed.
 *
 * Signatures are checked with `standardwebhooks`, the Standard Webhooks specification's own library
 * (standardwebhooks.com, "Verifying webhooks"), not with the server's code.
 */
import { createServer, type IncomingHttpHeaders, type Server } from 'node:http'
import { Webhook } from 'standardwebhooks'
import type { WebhookDeliveryDto } from '../../shared/types/webhook'
import { afterAll, beforeAll, describe, expect, it, onTestFailed } from 'vitest'
import { DEMO, DEMO_PASSWORD, signInAt } from '../support/api'
import { freePort } from '../support/ports'
import { startTestServer, type TestServer } from '../support/test-server'

interface Received {
  id: string
  type: string
  body: string
  headers: IncomingHttpHeaders
  answered: number
}

/** A receiver with a switch: answer 200, answer 500 (`failing` more times), or hold each request unanswered. */
class Receiver {
  received: Received[] = []
  failing = 0
  holding = false
  held: (() => void)[] = []
  server!: Server
  url = ''

  async start() {
    const port = await freePort()
    this.server = createServer((request, response) => {
      let body = ''
      request.on('data', chunk => (body += chunk))
      request.on('end', () => {
        const answer = (status: number) => {
          this.received.push({ id: String(request.headers['webhook-id']), type: JSON.parse(body).type, body, headers: request.headers, answered: status })
          response.writeHead(status).end(status === 200 ? 'ok' : 'not today')
        }
        if (this.holding) this.held.push(() => response.destroy())
        else if (this.failing > 0) {
          this.failing--
          answer(500)
        }
        else answer(200)
      })
    })
    await new Promise<void>(listening => this.server.listen(port, '127.0.0.1', listening))
    this.url = `http://127.0.0.1:${port}/hooks`
  }

  release() {
    this.holding = false
    for (const drop of this.held.splice(0)) drop()
  }

  /** Each message this receiver took (answered 200), in the order taken. */
  taken() {
    return this.received.filter(entry => entry.answered === 200)
  }

  close() {
    this.release()
    this.server.closeAllConnections()
    this.server.close()
  }
}

const headersOf = (entry: Received) => entry.headers as Record<string, string>

let server: TestServer
beforeAll(async () => {
  server = await startTestServer({ NUXT_WEBHOOK_RETRY_SECONDS: '0.3', NUXT_WEBHOOK_TIMEOUT_SECONDS: '1' })
}, 60_000)
afterAll(async () => {
  await server?.dispose()
})

const signIn = (email: string) => signInAt(server.baseURL, email)

async function call(path: string, cookie: string, body?: unknown, method = body === undefined ? 'GET' : 'POST') {
  const response = await fetch(`${server.baseURL}${path}`, {
    method,
    headers: { 'content-type': 'application/json', cookie },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  return { status: response.status, body: await response.json() }
}

const waitingAt = async (cookie: string, id: number) =>
  ((await call('/api/admin/webhooks', cookie)).body as { id: number, waiting: number }[]).find(endpoint => endpoint.id === id)!.waiting

const ALL_EVENTS = ['record.released', 'record.returned', 'record.voided', 'record.corrected', 'trend.alert-raised', 'gauge.calibration-due']

describe('webhooks', () => {
  it('a receiver that fails three times then recovers gets each event once, signed, in order per record', { timeout: 90_000 }, async () => {
    onTestFailed(() => console.error(server.log.join('')))
    const admin = await signIn(DEMO.admin)
    const inspector = await signIn(DEMO.inspector)
    const flaky = new Receiver()
    const steady = new Receiver()
    await flaky.start()
    await steady.start()
    try {
      flaky.failing = 3
      const everything = await call('/api/admin/webhooks', admin, { url: flaky.url, description: 'Maintenance tracking (test)', events: ALL_EVENTS })
      expect(everything.status).toBe(201)
      expect(everything.body.secret).toMatch(/^whsec_/)
      const releasedOnly = await call('/api/admin/webhooks', admin, { url: steady.url, description: 'Records archive (test)', events: ['record.released'] })
      expect(releasedOnly.status).toBe(201)
      // The secret is never shown again.
      const listed = await call('/api/admin/webhooks', admin)
      expect(JSON.stringify(listed.body)).not.toContain(everything.body.secret)

      // Two of the demo technician's worksheets awaiting countersign: one returned, signed again and released;
      // one returned and voided.
      const technician = await signIn(DEMO.technician)
      const queue = await call('/api/worksheets?state=awaiting-countersign&pageSize=10', inspector)
      const [first, second, third] = (queue.body.items as { id: number, performer: string }[]).filter(item => item.performer === 'Rowan Hale')
      expect(third).toBeDefined()
      const ok = async (request: Promise<{ status: number, body: unknown }>) => {
        const answer = await request
        expect(answer.status, JSON.stringify(answer.body)).toBe(200)
      }
      await ok(call(`/api/worksheets/${first!.id}/return`, inspector, { reason: 'Gauge photo missing; attach it and sign again.' }))
      await ok(call(`/api/worksheets/${second!.id}/return`, inspector, { reason: 'Work order number does not match the task card.' }))
      await ok(call(`/api/worksheets/${first!.id}/sign`, technician, { certify: true, password: DEMO_PASSWORD }))
      await ok(call(`/api/worksheets/${second!.id}/void`, admin, { reason: 'Raised twice for one work order.' }))
      await ok(call(`/api/worksheets/${first!.id}/countersign`, inspector, { certify: true, password: DEMO_PASSWORD }))

      const recordEvents = (receiver: Receiver, id: number) => receiver.taken()
        .filter(entry => entry.type.startsWith('record.') && JSON.parse(entry.body).data.worksheetId === id)
        .map(entry => entry.type)
      await expect.poll(() => recordEvents(flaky, first!.id), { timeout: 30_000 }).toEqual(['record.returned', 'record.released'])
      await expect.poll(() => recordEvents(flaky, second!.id), { timeout: 30_000 }).toEqual(['record.returned', 'record.voided'])
      await expect.poll(() => recordEvents(steady, first!.id), { timeout: 30_000 }).toEqual(['record.released'])
      expect(recordEvents(steady, second!.id)).toEqual([])

      // The first three tries were refused, and retried.
      expect(flaky.received.slice(0, 3).map(entry => entry.answered)).toEqual([500, 500, 500])
      // Exactly once per endpoint: no webhook-id taken twice; the archive got nothing it did not ask for.
      for (const receiver of [flaky, steady]) {
        const ids = receiver.taken().map(entry => entry.id)
        expect(new Set(ids).size).toBe(ids.length)
      }
      expect(steady.taken().every(entry => entry.type === 'record.released')).toBe(true)
      // Every message (refused ones too) carries a valid signature under its endpoint's secret.
      const verify = (receiver: Receiver, secret: string) => {
        const webhook = new Webhook(secret)
        for (const entry of receiver.received) {
          expect(webhook.verify(entry.body, headersOf(entry))).toMatchObject({ type: entry.type })
        }
      }
      verify(flaky, everything.body.secret)
      verify(steady, releasedOnly.body.secret)
      // Under another secret it does not verify.
      const [firstMessage] = flaky.received
      expect(() => new Webhook(releasedOnly.body.secret).verify(firstMessage!.body, headersOf(firstMessage!))).toThrow()
      // The message says what happened, in the record's own words.
      const voided = flaky.taken().find(entry => entry.type === 'record.voided' && JSON.parse(entry.body).data.worksheetId === second!.id)!
      expect(JSON.parse(voided.body).data).toMatchObject({ state: 'voided', reason: 'Raised twice for one work order.' })

      // The history, once nothing is waiting (the expired gauge's message may still be in its backoff): every
      // delivery taken on its last attempt (200); the three refusals (500) kept as attempts.
      await expect.poll(() => waitingAt(admin, everything.body.id), { timeout: 15_000 }).toBe(0)
      const history = await call(`/api/admin/webhooks/${everything.body.id}/deliveries`, admin)
      expect(history.status).toBe(200)
      const deliveries = history.body as WebhookDeliveryDto[]
      expect(deliveries.filter(delivery => delivery.eventType.startsWith('record.')).length).toBe(4)
      for (const delivery of deliveries) {
        expect(delivery.status).toBe('delivered')
        expect(delivery.history.at(-1)!.statusCode).toBe(200)
      }
      const codes = deliveries.flatMap(delivery => delivery.history.map(attempt => attempt.statusCode))
      expect(codes.filter(code => code === 500)).toHaveLength(3)

      // A gauge given a calibration date within 30 days is announced once, however often it is checked.
      const gauges = (await call('/api/tools?pageSize=100', admin)).body.items as { id: number, kind: string, assetNumber: string, calibrationDue: string | null }[]
      const gauge = gauges.find(tool => tool.kind === 'gauge' && tool.calibrationDue && tool.calibrationDue > new Date(Date.now() + 60 * 86_400_000).toISOString().slice(0, 10))!
      const soon = new Date(Date.now() + 10 * 86_400_000).toISOString().slice(0, 10)
      await ok(call(`/api/tools/${gauge.id}`, admin, { calibrationDue: soon }, 'PATCH'))
      await ok(call(`/api/tools/${gauge.id}`, admin, { description: 'Charging gauge, 0-5000 psi (rechecked)' }, 'PATCH'))
      const gaugeNews = () => flaky.taken().filter(entry => entry.type === 'gauge.calibration-due' && JSON.parse(entry.body).data.assetNumber === gauge.assetNumber)
      await expect.poll(() => gaugeNews().length, { timeout: 15_000 }).toBe(1)
      expect(JSON.parse(gaugeNews()[0]!.body).data).toMatchObject({ calibrationDue: soon, overdue: false })

      // A replay sends the same message again, with the same webhook-id; audited.
      const before = flaky.taken().length
      const replayed = await call(`/api/admin/webhooks/deliveries/${deliveries[0]!.id}/replay`, admin, {})
      expect(replayed.status).toBe(200)
      await expect.poll(() => flaky.taken().length, { timeout: 10_000 }).toBe(before + 1)
      expect(flaky.taken().at(-1)!.id).toBe(deliveries[0]!.messageId)
      const audit = await call('/api/audit/events?entity=webhook&pageSize=50', admin)
      expect(JSON.stringify(audit.body)).toContain('replayed')

      // Switched off: its events wait; switched on again: they are sent.
      expect((await call(`/api/admin/webhooks/${releasedOnly.body.id}`, admin, { active: false }, 'PATCH')).status).toBe(200)
      await ok(call(`/api/worksheets/${third!.id}/countersign`, inspector, { certify: true, password: DEMO_PASSWORD }))
      expect(await waitingAt(admin, releasedOnly.body.id)).toBe(1)
      expect((await call(`/api/admin/webhooks/${releasedOnly.body.id}`, admin, { active: true }, 'PATCH')).status).toBe(200)
      await expect.poll(() => recordEvents(steady, third!.id), { timeout: 15_000 }).toEqual(['record.released'])
    }
    finally {
      flaky.close()
      steady.close()
    }
  })

  it('answers bad input naming the field, refuses other roles, and sends a test message', async () => {
    const admin = await signIn(DEMO.admin)
    const bad = await call('/api/admin/webhooks', admin, { url: 'http://mro.example/hooks', description: 'x', events: ['record.exploded'] })
    expect(bad.status).toBe(400)
    const text = JSON.stringify(bad.body)
    expect(text).toContain('url')
    expect(text).toContain('description')
    expect(text).toContain('events')
    for (const role of ['technician', 'inspector', 'engineer'] as const) {
      const cookie = await signIn(DEMO[role])
      expect((await call('/api/admin/webhooks', cookie)).status).toBe(403)
      expect((await call('/api/admin/webhooks', cookie, { url: 'https://mro.example/hooks', description: 'Tracking', events: ['record.released'] })).status).toBe(403)
    }
    const receiver = new Receiver()
    await receiver.start()
    try {
      const endpoint = await call('/api/admin/webhooks', admin, { url: receiver.url, description: 'Ping target', events: ['record.voided'] })
      const sent = await call(`/api/admin/webhooks/${endpoint.body.id}/test`, admin, {})
      expect(sent.status).toBe(202)
      await expect.poll(() => receiver.taken().map(entry => entry.type), { timeout: 15_000 }).toEqual(['webhook.test'])
      const [ping] = receiver.taken()
      expect(new Webhook(endpoint.body.secret).verify(ping!.body, headersOf(ping!))).toBeTruthy()
      expect((await call('/api/admin/webhooks/999999/test', admin, {})).status).toBe(404)
      expect((await call(`/api/admin/webhooks/${endpoint.body.id}`, admin, { active: false }, 'PATCH')).body.active).toBe(false)
    }
    finally {
      receiver.close()
    }
  })

  it('a kill -9 with deliveries pending, some mid-send, loses none', { timeout: 120_000 }, async () => {
    onTestFailed(() => console.error(server.log.join('')))
    let admin = await signIn(DEMO.admin)
    const receiver = new Receiver()
    await receiver.start()
    try {
      const endpoint = await call('/api/admin/webhooks', admin, { url: receiver.url, description: 'Crash receiver', events: ['record.voided', 'record.returned'] })
      expect(endpoint.status).toBe(201)
      // The receiver takes each request and never answers: deliveries are being sent when the server dies.
      receiver.holding = true
      const technician = await signIn(DEMO.technician)
      const units = (await call('/api/accumulators?installed=true&pageSize=50', technician)).body.items as { id: number }[]
      const ids: number[] = []
      for (const [index, unit] of units.slice(0, 12).entries()) {
        const created = await call('/api/worksheets', technician, { accumulatorId: unit.id, workOrder: `WO-HOOK-${index}`, reason: 'scheduled' })
        expect(created.status).toBe(201)
        ids.push(created.body.id)
      }
      for (const id of ids) expect((await call(`/api/worksheets/${id}/void`, admin, { reason: 'Test of delivery after a crash.' })).status).toBe(200)
      await expect.poll(() => receiver.held.length, { timeout: 15_000 }).toBeGreaterThan(0)
      await server.stop({ kill: true })
      receiver.release()
      await server.start()
      admin = await signIn(DEMO.admin)
      // Every acknowledged void's event arrives, once.
      const voidedIds = () => new Set(receiver.taken().map(entry => JSON.parse(entry.body).data.worksheetId))
      await expect.poll(() => voidedIds().size, { timeout: 60_000 }).toBe(ids.length)
      const taken = receiver.taken().map(entry => entry.id)
      expect(new Set(taken).size).toBe(taken.length)
      const history = await call(`/api/admin/webhooks/${endpoint.body.id}/deliveries`, admin)
      expect((history.body as { status: string }[]).map(delivery => delivery.status)).toEqual(ids.map(() => 'delivered'))
    }
    finally {
      receiver.close()
    }
  })
})
