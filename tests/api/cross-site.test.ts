/**
 * Cross-site request forgery from the same host (another port is the same site, so the session
 * cookie goes along): a state-changing request must come from Chargewell itself and carry JSON.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { sql } from '../support/database'
import { baseURL, fileDatabase } from '../support/file-server'

let admin: string
let released: number
beforeAll(async () => {
  admin = await signIn(DEMO.admin)
  const [row] = await sql<{ id: number }>(fileDatabase(), 'SELECT id FROM worksheets WHERE state = ? ORDER BY id LIMIT 1', ['released'])
  released = row!.id
})

const elsewhere = () => baseURL().replace(/:(\d+)$/, (_, port) => `:${Number(port) + 1}`)
const stateOf = async (id: number) => (await api(`/api/worksheets/${id}`, { cookie: admin })).body.state

describe('a request that changes records from another origin', () => {
  it('a form post from another port of the same host is refused (403) and changes nothing', async () => {
    const response = await fetch(`${baseURL()}/api/worksheets/${released}/void`, {
      method: 'POST',
      headers: { 'cookie': admin, 'origin': elsewhere(), 'content-type': 'application/x-www-form-urlencoded' },
      body: 'reason=Forged+from+another+page',
    })
    expect(response.status).toBe(403)
    expect((await response.json()).message).toMatch(/must come from Chargewell itself/)
    expect(await stateOf(released)).toBe('released')
  })

  it('JSON from another origin, or a browser that says "cross-site", is refused too', async () => {
    const forgeries: Record<string, string>[] = [{ origin: elsewhere() }, { 'sec-fetch-site': 'same-site' }, { 'sec-fetch-site': 'cross-site' }]
    for (const headers of forgeries) {
      const answer = await api(`/api/worksheets/${released}/return`, { cookie: admin, body: { reason: 'Forged' }, headers })
      expect(answer.status).toBe(403)
    }
  })

  it('a body that is not JSON is refused (415) even without an Origin, naming what to send', async () => {
    for (const type of ['application/x-www-form-urlencoded', 'text/plain', 'multipart/form-data; boundary=x']) {
      const answer = await api(`/api/worksheets/${released}/void`, { cookie: admin, raw: '{"reason":"Forged text"}', headers: { 'content-type': type } })
      expect(answer.status).toBe(415)
      expect(answer.body.message).toMatch(/as JSON/)
    }
    expect(await stateOf(released)).toBe('released')
  })

  it('the app\'s own origin and other systems (no Origin header) are served as before', async () => {
    const body = { pressureUnit: 'psi', temperatureUnit: 'C', volumeUnit: 'in3', stationElevation: { value: 420, unit: 'ft' }, stationName: 'Harlow Moor' }
    const own = await api('/api/me/preferences', { method: 'PATCH', cookie: admin, body, headers: { 'origin': baseURL(), 'sec-fetch-site': 'same-origin' } })
    expect(own.status).toBe(200)
    expect((await api('/api/me/preferences', { method: 'PATCH', cookie: admin, body })).status).toBe(200)
  })
})
