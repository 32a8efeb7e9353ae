/**
 * kill -9 of the server under write load: every write it acknowledged is there after the
 * restart, and the audit chain (with its sealed head) verifies. SQLite's write-ahead log with
 * synchronous=FULL commits before the answer is sent.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO, signInAt } from '../support/api'
import { startTestServer, type TestServer } from '../support/test-server'

let server: TestServer
beforeAll(async () => {
  server = await startTestServer()
}, 60_000)
afterAll(async () => {
  await server.dispose()
})

const signIn = (email: string) => signInAt(server.baseURL, email)

async function call(path: string, cookie: string, method: string, body: unknown) {
  const response = await fetch(`${server.baseURL}${path}`, { method, headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify(body) })
  return { status: response.status, body: await response.json() }
}

describe('a crash under write load', () => {
  it('loses no acknowledged write, and the chain verifies after restart', { timeout: 30_000 }, async () => {
    const technician = await signIn(DEMO.technician)
    const units = (await (await fetch(`${server.baseURL}/api/accumulators?installed=true&pageSize=50`, { headers: { cookie: technician } })).json()).items as { id: number }[]
    const created: number[] = []
    const prepared: number[] = []
    let running = true
    const writer = async (lane: number) => {
      for (let index = 0; running; index++) {
        try {
          const answer = await call('/api/worksheets', technician, 'POST', { accumulatorId: units[(lane * 7 + index) % units.length]!.id, workOrder: `WO-CRASH-${lane}-${index}`, reason: 'scheduled' })
          if (answer.status !== 201) throw new Error(`create answered ${answer.status}`)
          created.push(answer.body.id)
          const step = await call(`/api/worksheets/${answer.body.id}`, technician, 'PATCH', { step: 'preparation', systemDepressurised: true, aircraftSafe: true })
          if (step.status !== 200) throw new Error(`step answered ${step.status}`)
          prepared.push(answer.body.id)
        }
        catch (error) {
          // Only the crash may interrupt a write; anything before it is a failure of the test.
          if (running) throw error
        }
      }
    }
    const lanes = [0, 1, 2, 3].map(lane => writer(lane).catch(error => error as Error))
    // Under load, not after a time: the crash comes once the writers have been acknowledged a while.
    await expect.poll(() => created.length, { timeout: 25_000, interval: 50 }).toBeGreaterThan(25)
    await server.stop({ kill: true })
    running = false
    const outcomes = await Promise.all(lanes)
    expect(outcomes.filter(outcome => outcome instanceof Error && !/fetch failed|ECONNRESET|other side closed|socket/i.test(String(outcome.message ?? outcome)))).toEqual([])
    expect(created.length).toBeGreaterThan(20)

    await server.start()
    const admin = await signIn(DEMO.admin)
    for (const id of created) {
      const answer = await fetch(`${server.baseURL}/api/worksheets/${id}`, { headers: { cookie: admin } })
      expect(answer.status, `worksheet ${id} acknowledged before the crash`).toBe(200)
      const worksheet = await answer.json()
      if (prepared.includes(id)) expect(worksheet.content.preparation, `step of worksheet ${id}`).toHaveProperty('systemDepressurised')
    }
    const chain = await (await fetch(`${server.baseURL}/api/audit/verify`, { headers: { cookie: admin } })).json()
    expect(chain).toMatchObject({ ok: true, mismatches: 0, headProblems: [] })
    console.info(`kill -9 under load: ${created.length} creations and ${prepared.length} step saves acknowledged, all present after restart; ${chain.checked} audit entries verified.`)
  })
})
