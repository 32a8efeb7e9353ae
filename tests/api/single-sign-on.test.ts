/**
 * Single sign-on through OpenID Connect, against a real provider started here
 * (tests/support/identity-provider.ts): the code flow with PKCE from Chargewell's button to a session,
 * roles and stations mapped from the provider's claims (and audited when they change), an unknown person and a
 * person with no Chargewell group refused in words, a forged state refused, passwords switched off for all but
 * administrators, and signing still asking the signer's own password.
 */
import { afterAll, beforeAll, describe, expect, it, onTestFailed } from 'vitest'
import { DEMO, DEMO_PASSWORD } from '../support/api'
import { startIdentityProvider, ssoEnvironment } from '../support/identity-provider'
import { freePort } from '../support/ports'
import { startTestServer, type TestServer } from '../support/test-server'

/** The people the provider knows, by subject. */
const PEOPLE: Record<string, Record<string, unknown>> = {
  'idp-rowan': { email: DEMO.technician, email_verified: true, name: 'Rowan Hale', groups: ['mro-technicians', 'mro-inspectors'], chargewell_stations: ['SKB'] },
  'idp-sol': { email: DEMO.engineer, email_verified: true, name: 'Sol Varga', groups: ['staff'] },
  'idp-stranger': { email: 'stranger@fellmoor.example', email_verified: true, name: 'Stranger', groups: ['mro-technicians'] },
}
let idp: Awaited<ReturnType<typeof startIdentityProvider>>
let server: TestServer
let issuer: string
beforeAll(async () => {
  const idpPort = await freePort()
  issuer = `http://127.0.0.1:${idpPort}`
  server = await startTestServer({ ...ssoEnvironment(issuer), NUXT_PASSWORD_SIGN_IN: 'false' })
  idp = await startIdentityProvider(idpPort, `${server.baseURL}/api/auth/sso/callback`, PEOPLE)
}, 60_000)
afterAll(async () => {
  await server?.dispose()
  await idp?.close()
})

/** A browser, roughly: follows redirects by hand across Chargewell and the provider, keeping each one's cookies. */
async function browse(start: string, maxHops = 12) {
  const jar = new Map<string, Map<string, string>>()
  let url = new URL(start)
  for (let hop = 0; hop < maxHops; hop++) {
    const cookies = jar.get(url.origin) ?? new Map<string, string>()
    const response = await fetch(url, { redirect: 'manual', headers: { cookie: [...cookies].map(([name, value]) => `${name}=${value}`).join('; ') } })
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(';')
      const [name, ...value] = pair!.split('=')
      cookies.set(name!.trim(), value.join('='))
    }
    jar.set(url.origin, cookies)
    const location = response.headers.get('location')
    if (response.status < 300 || response.status >= 400 || !location) {
      return { url, status: response.status, text: await response.text(), jar }
    }
    url = new URL(location, url)
    // Landed back on Chargewell's own pages (not its API): where a browser would render the page.
    if (url.origin === server.baseURL && !url.pathname.startsWith('/api/')) {
      return { url, status: response.status, text: '', jar }
    }
  }
  throw new Error(`More than ${maxHops} redirects from ${start}`)
}

function appCookie(result: Awaited<ReturnType<typeof browse>>): string {
  return [...(result.jar.get(server.baseURL) ?? new Map())].map(([name, value]) => `${name}=${value}`).join('; ')
}

const me = async (cookie: string) => (await fetch(`${server.baseURL}/api/me`, { headers: { cookie } })).json()

describe('single sign-on through OpenID Connect', () => {
  it('the sign-in page offers it; a known person signs in, with roles and stations from the claims, audited', { timeout: 60_000 }, async () => {
    onTestFailed(() => console.error(server.log.join('')))
    const methods = await (await fetch(`${server.baseURL}/api/auth/methods`)).json()
    expect(methods).toEqual({ password: false, sso: { name: 'Fellmoor sign-in', start: '/api/auth/sso/start' } })

    idp.signInAs('idp-rowan')
    const landed = await browse(`${server.baseURL}/api/auth/sso/start?next=/worksheets`)
    expect(landed.url.pathname).toBe('/worksheets')
    const cookie = appCookie(landed)
    const user = await me(cookie)
    expect(user.email).toBe(DEMO.technician)
    // groups mro-technicians + mro-inspectors → technician and inspector; chargewell_stations SKB → Skelby only.
    expect([...user.roles].sort()).toEqual(['inspector', 'technician'])
    const scope = await (await fetch(`${server.baseURL}/api/me/scope`, { headers: { cookie } })).json()
    expect(JSON.stringify(scope)).toContain('Skelby')
    expect(JSON.stringify(scope)).not.toContain('Harlow Moor')

    // The change of roles and stations is in the audit trail, said to come from single sign-on.
    const admin = await fetch(`${server.baseURL}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: DEMO.admin, password: DEMO_PASSWORD }) })
    expect(admin.status).toBe(200)
    const adminCookie = admin.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    const audit = await (await fetch(`${server.baseURL}/api/audit/events?entity=user&pageSize=50`, { headers: { cookie: adminCookie } })).json()
    const text = JSON.stringify(audit)
    expect(text).toContain('Inspector')
    expect(text).toMatch(/roles-changed/)

    // Signing a record still asks the signer's own password: the single sign-on does not sign.
    const queue = await (await fetch(`${server.baseURL}/api/worksheets?state=draft&pageSize=5`, { headers: { cookie } })).json()
    const draft = queue.items?.[0]
    if (draft) {
      const unsigned = await fetch(`${server.baseURL}/api/worksheets/${draft.id}/sign`, { method: 'POST', headers: { 'content-type': 'application/json', cookie }, body: JSON.stringify({ certify: true }) })
      expect(unsigned.status).toBe(400)
      expect(JSON.stringify(await unsigned.json())).toContain('password')
    }

    // Again: found by the provider's subject, not asked to link again.
    const again = await browse(`${server.baseURL}/api/auth/sso/start`)
    expect(again.url.pathname).toBe('/')
    expect((await me(appCookie(again))).email).toBe(DEMO.technician)
  })

  it('refuses a person Chargewell does not know, and one with no Chargewell group, in words', { timeout: 60_000 }, async () => {
    idp.signInAs('idp-stranger')
    const stranger = await browse(`${server.baseURL}/api/auth/sso/start`)
    expect(stranger.url.pathname).toBe('/login')
    expect(stranger.url.searchParams.get('refused')).toContain('stranger@fellmoor.example has no Chargewell account')
    expect(appCookie(stranger)).not.toContain('nuxt-session')

    idp.signInAs('idp-sol')
    const noRole = await browse(`${server.baseURL}/api/auth/sso/start`)
    expect(noRole.url.pathname).toBe('/login')
    expect(noRole.url.searchParams.get('refused')).toContain('no Chargewell role')
  })

  it('refuses a callback whose state was not the one sent', async () => {
    const start = await fetch(`${server.baseURL}/api/auth/sso/start`, { redirect: 'manual' })
    const flowCookie = start.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    const forged = await fetch(`${server.baseURL}/api/auth/sso/callback?code=forged&state=not-the-one&iss=${encodeURIComponent(issuer)}`, { redirect: 'manual', headers: { cookie: flowCookie } })
    expect(forged.status).toBe(302)
    expect(new URL(forged.headers.get('location')!, server.baseURL).searchParams.get('refused')).toMatch(/could not be accepted/)
    // The provider's own refusal is said too.
    const denied = await fetch(`${server.baseURL}/api/auth/sso/callback?error=access_denied&error_description=The+user+cancelled`, { redirect: 'manual' })
    expect(new URL(denied.headers.get('location')!, server.baseURL).searchParams.get('refused')).toContain('The user cancelled')
  })

  it('with passwords switched off, only an administrator signs in with one', async () => {
    const login = (email: string) => fetch(`${server.baseURL}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) })
    const technician = await login(DEMO.inspector)
    expect(technician.status).toBe(403)
    expect((await technician.json()).message).toContain('Sign in through Fellmoor sign-in')
    expect((await login(DEMO.admin)).status).toBe(200)
  })
})
