/**
 * A session lasts only as long as its reason: sign-out, a password change or reset, disabling
 * and a role change end it on the server, whatever the cookie still says. Anonymous requests
 * create no session; unknown API paths are 404 JSON; every answer carries the security headers.
 */
import { request } from 'node:http'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { baseURL } from '../support/file-server'
import { startTestServer } from '../support/test-server'

/** A fresh sign-in (a new device), not the cached one. */
async function newSession(email: string, password = DEMO_PASSWORD): Promise<string> {
  const answer = await api('/api/auth/login', { body: { email, password }, headers: { 'user-agent': 'Mozilla/5.0 (iPad; CPU OS 17_0 like Mac OS X) Safari/605.1' } })
  expect(answer.status, JSON.stringify(answer.body)).toBe(200)
  return answer.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
}

const me = (cookie: string) => api('/api/me', { cookie })

let admin: string
beforeAll(async () => {
  admin = await signIn(DEMO.admin)
})

async function newUser(roles: string[] = ['technician']) {
  const email = `session-${Date.now()}-${Math.random().toString(36).slice(2, 6)}@chargewell.test`
  const created = await api('/api/admin/users', { cookie: admin, body: { email, name: 'Sess Ion', roles, password: 'first-password-1' } })
  expect(created.status).toBe(201)
  return { id: created.body.id as number, email, password: 'first-password-1' }
}

describe('a session ends with its reason', () => {
  it('sign-out: the old cookie no longer answers /api/me or the session endpoint', async () => {
    const cookie = await newSession(DEMO.engineer)
    expect((await me(cookie)).status).toBe(200)
    expect((await api('/api/auth/logout', { method: 'POST', cookie })).status).toBe(200)
    const after = await me(cookie)
    expect(after.status).toBe(401)
    expect(after.body.message).toMatch(/signed out/)
    expect((await api('/api/_auth/session', { cookie })).body.user).toBeUndefined()
  })

  it('an admin\'s password reset ends the user\'s sessions', async () => {
    const user = await newUser()
    const cookie = await newSession(user.email, user.password)
    expect((await api(`/api/admin/users/${user.id}/password`, { cookie: admin, body: { password: 'reset-password-22' } })).status).toBe(200)
    expect((await me(cookie)).status).toBe(401)
    expect((await newSession(user.email, 'reset-password-22'))).toBeTruthy()
  })

  it('disabling ends the sessions, and re-enabling does not revive them', async () => {
    const user = await newUser()
    const cookie = await newSession(user.email, user.password)
    expect((await api(`/api/admin/users/${user.id}`, { method: 'PATCH', cookie: admin, body: { disabled: true } })).status).toBe(200)
    expect((await me(cookie)).status).toBe(401)
    expect((await api(`/api/admin/users/${user.id}`, { method: 'PATCH', cookie: admin, body: { disabled: false } })).status).toBe(200)
    expect((await me(cookie)).status).toBe(401)
  })

  it('a role change ends the sessions; a name change shows at once on the session endpoint', async () => {
    const user = await newUser(['technician'])
    const cookie = await newSession(user.email, user.password)
    expect((await api(`/api/admin/users/${user.id}`, { method: 'PATCH', cookie: admin, body: { name: 'Sess Ion-Renamed' } })).status).toBe(200)
    expect((await api('/api/_auth/session', { cookie })).body.user).toMatchObject({ name: 'Sess Ion-Renamed', roles: ['technician'] })
    expect((await api(`/api/admin/users/${user.id}`, { method: 'PATCH', cookie: admin, body: { roles: ['technician', 'inspector'] } })).status).toBe(200)
    expect((await me(cookie)).status).toBe(401)
    expect((await api('/api/_auth/session', { cookie })).body.user).toBeUndefined()
  })
})

describe('the user\'s own sessions and password', () => {
  it('lists the devices, ends one, and signs out everywhere else', async () => {
    const user = await newUser()
    const here = await newSession(user.email, user.password)
    const tablet = await newSession(user.email, user.password)
    const phone = await newSession(user.email, user.password)
    const listed = await api('/api/me/sessions', { cookie: here })
    expect(listed.body).toHaveLength(3)
    expect(listed.body.filter((session: { current: boolean }) => session.current)).toHaveLength(1)
    expect(listed.body[0].userAgent).toMatch(/iPad/)

    const tabletId = (await api('/api/me/sessions', { cookie: tablet })).body.find((session: { current: boolean }) => session.current).id
    expect((await api(`/api/me/sessions/${tabletId}`, { method: 'DELETE', cookie: here })).status).toBe(200)
    expect((await me(tablet)).status).toBe(401)
    expect((await me(phone)).status).toBe(200)
    // Someone else's session cannot be ended from here.
    const adminSession = (await api('/api/me/sessions', { cookie: admin })).body[0].id
    expect((await api(`/api/me/sessions/${adminSession}`, { method: 'DELETE', cookie: here })).status).toBe(404)

    expect((await api('/api/me/sessions/end-others', { method: 'POST', cookie: here })).status).toBe(200)
    expect((await me(phone)).status).toBe(401)
    expect((await me(here)).status).toBe(200)
    expect((await api('/api/me/sessions', { cookie: here })).body).toHaveLength(1)
  })

  it('changes the password with the current one; other sessions end, this one stays', async () => {
    const user = await newUser()
    const here = await newSession(user.email, user.password)
    const other = await newSession(user.email, user.password)
    const wrong = await api('/api/me/password', { cookie: here, body: { currentPassword: 'not-it-at-all', newPassword: 'second-password-2' } })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.issues[0].field).toBe('currentPassword')
    const short = await api('/api/me/password', { cookie: here, body: { currentPassword: user.password, newPassword: 'short' } })
    expect(short.status).toBe(400)
    expect(short.body.data.issues[0].field).toBe('newPassword')
    expect((await api('/api/me/password', { cookie: here, body: { currentPassword: user.password, newPassword: 'second-password-2' } })).status).toBe(200)
    expect((await me(other)).status).toBe(401)
    expect((await me(here)).status).toBe(200)
    expect((await api('/api/auth/login', { body: { email: user.email, password: user.password } })).status).toBe(401)
    expect(await newSession(user.email, 'second-password-2')).toBeTruthy()
  })
})

describe('anonymous requests and unknown paths', () => {
  it.each(['/', '/login', '/charge-target', '/api/health', '/api/me', '/api/_auth/session', '/api/no-such-thing'])('%s sets no session cookie', async (path) => {
    const answer = await api(path)
    const cookies = answer.headers.getSetCookie().filter(line => /^nuxt-session=[^;]+/.test(line))
    expect(cookies).toEqual([])
  })

  it.each([['GET', undefined], ['POST', {}], ['PATCH', {}]])('an unknown /api path answers %s with 404 JSON, signed in or not', async (method, body) => {
    for (const cookie of [undefined, admin]) {
      const answer = await api('/api/worksheetz/12', { method, body, cookie })
      expect(answer.status).toBe(404)
      expect(answer.headers.get('content-type')).toMatch(/json/)
      expect(answer.body.message).toMatch(/There is no API route/)
    }
  })
})

describe('security headers', () => {
  const common = (headers: Headers) => {
    expect(headers.get('x-content-type-options')).toBe('nosniff')
    expect(headers.get('x-frame-options')).toBe('DENY')
    expect(headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/)
    expect(headers.get('referrer-policy')).toBeTruthy()
    expect(headers.get('x-powered-by')).toBeNull()
    expect(headers.get('strict-transport-security')).toBeNull()
  }

  it('on a page: a nonce-based script policy', async () => {
    const page = await fetch(`${baseURL()}/login`)
    common(page.headers)
    const policy = page.headers.get('content-security-policy')!
    expect(policy).toMatch(/script-src 'self' 'strict-dynamic' 'nonce-[A-Za-z0-9+/=]+'/)
    expect(policy).not.toMatch(/script-src[^;]*unsafe-inline/)
    const nonce = policy.match(/'nonce-([^']+)'/)![1]
    const html = await page.text()
    for (const script of html.match(/<script\b[^>]*>/g) ?? []) {
      // Every script that runs carries the nonce; JSON payloads are data.
      if (!/type="application\/json"/.test(script)) expect(script).toContain(`nonce="${nonce}"`)
    }
  })

  it('on a successful API answer and on an error', async () => {
    const health = await api('/api/health')
    expect(health.status).toBe(200)
    common(health.headers)
    expect(health.headers.get('cache-control')).toBe('no-store')
    const refused = await api('/api/me')
    expect(refused.status).toBe(401)
    common(refused.headers)
    const missing = await fetch(`${baseURL()}/no-such-page`, { headers: { cookie: admin, accept: 'text/html' } })
    expect(missing.status).toBe(404)
    common(missing.headers)
    expect(await missing.text()).toContain('Nothing here')
  })

  it('HSTS only over TLS, as a trusted proxy reports it', async () => {
    const server = await startTestServer({ NUXT_TRUST_PROXY: 'true' })
    try {
      const plain = await fetch(`${server.baseURL}/api/health`)
      expect(plain.headers.get('strict-transport-security')).toBeNull()
      const secure = await fetch(`${server.baseURL}/api/health`, { headers: { 'x-forwarded-proto': 'https' } })
      expect(secure.headers.get('strict-transport-security')).toMatch(/max-age=\d{8}/)
    }
    finally {
      await server.dispose()
    }
  })
})

describe('the session cookie and the way the browser came', () => {
  /** Signs in with the Host (and forwarded protocol) a browser on that address would send; the Set-Cookie line. */
  function signInAs(host: string): Promise<string> {
    const target = new URL(baseURL())
    const body = JSON.stringify({ email: DEMO.inspector, password: DEMO_PASSWORD })
    return new Promise((resolve, reject) => {
      const sent = request({
        host: target.hostname,
        port: target.port,
        path: '/api/auth/login',
        method: 'POST',
        headers: { 'host': host, 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) },
      }, (response) => {
        response.resume()
        resolve((response.headers['set-cookie'] ?? []).join('\n'))
      })
      sent.on('error', reject)
      sent.end(body)
    })
  }

  it('is Secure on localhost, and not over plain HTTP on a LAN address (where a browser would drop it)', async () => {
    const local = await signInAs('localhost:3000')
    expect(local).toMatch(/; Secure/i)
    // No request another site starts carries it, a form on another port of this host included.
    expect(local).toMatch(/; SameSite=Strict/i)
    const lan = await signInAs('192.168.40.12:3000')
    expect(lan).toMatch(/nuxt-session=/)
    expect(lan).not.toMatch(/; Secure/i)
  })
})
