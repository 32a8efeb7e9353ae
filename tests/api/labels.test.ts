/**
 * A printed label lives on the unit for years: its code opens the configured public address, or the
 * address the request came to, and a production server never prints one only its own machine can open.
 */
import QRCode from 'qrcode'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { startTestServer, type TestServer } from '../support/test-server'

const code = (address: string) => QRCode.toString(address, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 })

let unconfigured: TestServer
beforeAll(async () => {
  // No NUXT_PUBLIC_URL, behind a trusted proxy, loopback labels not allowed: as a production server set up in haste.
  unconfigured = await startTestServer({ NUXT_PUBLIC_URL: '', NUXT_ALLOW_LOOPBACK_LABELS: '', NUXT_TRUST_PROXY: 'true' })
}, 60_000)
afterAll(async () => {
  await unconfigured?.dispose()
})

async function unitId(cookie: string, server = baseURL()): Promise<number> {
  const answer = await fetch(`${server}/api/accumulators?installed=true&pageSize=5`, { headers: { cookie } })
  return ((await answer.json()).items as { id: number }[])[0]!.id
}

describe('a unit\'s label', () => {
  it('opens the configured public address', async () => {
    const cookie = await signIn(DEMO.technician)
    const id = await unitId(cookie)
    const label = await api(`/api/accumulators/${id}/label`, { cookie, headers: { accept: 'image/svg+xml' } })
    expect(label.status).toBe(200)
    expect(label.body).toBe(await code(`${baseURL()}/fleet/units/${id}`))
  })

  it('with no address configured: the request\'s own address; never one only the server\'s machine can open', async () => {
    const login = await fetch(`${unconfigured.baseURL}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: DEMO.technician, password: DEMO_PASSWORD }),
    })
    expect(login.status).toBe(200)
    const cookie = login.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    const id = await unitId(cookie, unconfigured.baseURL)
    // Asked for at 127.0.0.1: refused, saying what to set.
    const local = await fetch(`${unconfigured.baseURL}/api/accumulators/${id}/label`, { headers: { cookie, accept: 'application/json' } })
    expect(local.status).toBe(409)
    const refusal = await local.json()
    expect(refusal.message).toMatch(/only the server's own machine can reach[\s\S]*Set NUXT_PUBLIC_URL/)
    expect(refusal.data.field).toBe('NUXT_PUBLIC_URL')
    // Asked for through the hangar's address (forwarded by the trusted proxy): the label opens that address.
    const forwarded = await fetch(`${unconfigured.baseURL}/api/accumulators/${id}/label`, {
      headers: { cookie, 'x-forwarded-host': 'chargewell.hangar.test', 'x-forwarded-proto': 'https' },
    })
    expect(forwarded.status).toBe(200)
    expect(await forwarded.text()).toBe(await code(`https://chargewell.hangar.test/fleet/units/${id}`))
  })
})
