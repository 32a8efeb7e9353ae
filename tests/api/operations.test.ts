/**
 * A server that says how it is doing: /metrics (Prometheus text, prom-client) refused without its token and
 * holding the named series; each request's id answered, logged as a JSON line (pino) and kept on the audit
 * entries it wrote; /api/health/live (up) apart from /api/health/ready (migrations, database, secrets).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO, signInAt } from '../support/api'
import { startTestServer, type TestServer } from '../support/test-server'

const TOKEN = 'metrics-token-only-for-this-test'
let server: TestServer
beforeAll(async () => {
  server = await startTestServer({ NUXT_METRICS_TOKEN: TOKEN })
}, 60_000)
afterAll(async () => {
  await server?.dispose()
})

const signIn = (email: string) => signInAt(server.baseURL, email)

describe('operations', () => {
  it('/metrics refuses without its token and exposes the named series', async () => {
    // Some traffic first: a page, an API read, a write.
    const admin = await signIn(DEMO.admin)
    await fetch(`${server.baseURL}/api/worksheets?pageSize=5`, { headers: { cookie: admin } })
    expect((await fetch(`${server.baseURL}/metrics`)).status).toBe(401)
    expect((await fetch(`${server.baseURL}/metrics`, { headers: { authorization: 'Bearer not-the-token' } })).status).toBe(401)
    const answer = await fetch(`${server.baseURL}/metrics`, { headers: { authorization: `Bearer ${TOKEN}` } })
    expect(answer.status).toBe(200)
    expect(answer.headers.get('content-type')).toContain('text/plain')
    const text = await answer.text()
    for (const series of [
      'chargewell_http_requests_total',
      'chargewell_http_request_duration_seconds_bucket',
      'chargewell_write_queue_wait_seconds_bucket',
      'chargewell_write_queue_waiting',
      'chargewell_database_pool_connections',
      'chargewell_mail_outbox_messages',
      'chargewell_webhook_deliveries',
      'chargewell_device_sync_in_flight',
      'chargewell_event_loop_delay_ms',
      'nodejs_eventloop_lag_seconds',
      'process_resident_memory_bytes',
    ]) expect(text, series).toContain(series)
    // Per route pattern, not per path: one series for every worksheet list.
    expect(text).toMatch(/chargewell_http_requests_total\{[^}]*route="\/api\/worksheets"[^}]*method="GET"[^}]*status="200"/)
    expect(text).toMatch(/chargewell_webhook_deliveries\{[^}]*state="waiting"/)
  })

  it('carries a request\'s id into its answer, its log line and its audit entries', async () => {
    const admin = await signIn(DEMO.admin)
    const requestId = 'ops-test-0042'
    const created = await fetch(`${server.baseURL}/api/admin/operators`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'cookie': admin, 'x-request-id': requestId },
      body: JSON.stringify({ name: 'Tarn Valley Air', code: 'TVA' }),
    })
    expect(created.status).toBe(201)
    expect(created.headers.get('x-request-id')).toBe(requestId)
    // One JSON line per request, with its id.
    await expect.poll(() => server.log.join('').split('\n').some(line => line.includes(`"reqId":"${requestId}"`))).toBe(true)
    const line = JSON.parse(server.log.join('').split('\n').find(entry => entry.includes(`"reqId":"${requestId}"`))!)
    expect(line).toMatchObject({ level: 'info', method: 'POST', route: '/api/admin/operators', status: 201, service: 'chargewell' })
    // The audit entry it wrote keeps the id.
    const audit = await (await fetch(`${server.baseURL}/api/audit/events?pageSize=20`, { headers: { cookie: admin } })).json()
    expect(audit.items.find((entry: { requestId: string | null }) => entry.requestId === requestId)).toBeTruthy()
    // A request without one is given one; a header that is not a plain token is not echoed.
    const plain = await fetch(`${server.baseURL}/api/health/live`)
    expect(plain.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/)
    const odd = await fetch(`${server.baseURL}/api/health/live`, { headers: { 'x-request-id': 'two words<script>' } })
    expect(odd.headers.get('x-request-id')).not.toContain('<')
  })

  it('says "up" apart from "ready", each check in words', async () => {
    const live = await fetch(`${server.baseURL}/api/health/live`)
    expect(live.status).toBe(200)
    expect(await live.json()).toMatchObject({ status: 'up' })
    const ready = await fetch(`${server.baseURL}/api/health/ready`)
    const body = await ready.json()
    expect(ready.status, JSON.stringify(body)).toBe(200)
    expect(body.status).toBe('ready')
    expect(Object.keys(body.checks).sort()).toEqual(['database', 'migrations', 'secrets', 'started'])
    expect(body.checks.migrations.detail).toMatch(/^All \d+ applied/)
  })
})
