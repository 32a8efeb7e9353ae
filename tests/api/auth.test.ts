import { describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'

describe('sign-in', () => {
  it.each([
    [DEMO.technician, ['technician']],
    [DEMO.inspector, ['inspector']],
    [DEMO.engineer, ['engineer']],
    [DEMO.admin, ['admin']],
    [DEMO.lead, ['technician', 'inspector']],
  ])('signs in %s with roles %j and never returns password fields', async (email, roles) => {
    const answer = await api('/api/auth/login', { body: { email, password: DEMO_PASSWORD } })
    expect(answer.status).toBe(200)
    expect(answer.body.roles).toEqual(roles)
    expect(JSON.stringify(answer.body)).not.toMatch(/password/i)
    const cookie = answer.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    const me = await api('/api/me', { cookie })
    expect(me.body.email).toBe(email)
  })

  it('gives the same 401 message for a wrong password and an unknown e-mail', async () => {
    const wrongPassword = await api('/api/auth/login', { body: { email: DEMO.engineer, password: 'not-the-password' } })
    const unknown = await api('/api/auth/login', { body: { email: 'nobody@chargewell.test', password: 'whatever-it-is' } })
    expect(wrongPassword.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrongPassword.body.message).toBe(unknown.body.message)
  })

  it('names the field when the e-mail is malformed', async () => {
    const answer = await api('/api/auth/login', { body: { email: 'not-an-email', password: 'x' } })
    expect(answer.status).toBe(400)
    expect(answer.body.data.issues[0].field).toBe('email')
  })

  it('locks an account after 5 failures within 15 minutes, with the wait time, even for the right password', async () => {
    const admin = await signIn(DEMO.admin)
    const email = `lockout-${Date.now()}@chargewell.test`
    const created = await api('/api/admin/users', { cookie: admin, body: { email, name: 'Lock Out', roles: ['technician'], password: 'a-long-password-1' } })
    expect(created.status).toBe(201)
    for (let attempt = 0; attempt < 5; attempt++) {
      expect((await api('/api/auth/login', { body: { email, password: 'wrong-password' } })).status).toBe(401)
    }
    const locked = await api('/api/auth/login', { body: { email, password: 'a-long-password-1' } })
    expect(locked.status).toBe(429)
    expect(locked.body.data.retryAfterSeconds).toBeGreaterThan(800)
    expect(locked.body.message).toMatch(/minute/)
    expect(Number(locked.headers.get('retry-after'))).toBeGreaterThan(800)
  })

  it('signs out', async () => {
    const answer = await api('/api/auth/login', { body: { email: DEMO.inspector, password: DEMO_PASSWORD } })
    const cookie = answer.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    const out = await api('/api/auth/logout', { method: 'POST', cookie })
    const cleared = out.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
    expect((await api('/api/me', { cookie: cleared })).status).toBe(401)
  })
})

describe('admin manages users', () => {
  it('creates a user, changes roles and authorisation, resets the password, disables', async () => {
    const admin = await signIn(DEMO.admin)
    const email = `new-${Date.now()}@chargewell.test`
    const created = await api('/api/admin/users', { cookie: admin, body: { email, name: 'Avery Quill', roles: ['technician'], authorisationNumber: 'FMR-T-0999', password: 'first-password-1' } })
    expect(created.status).toBe(201)
    const id = created.body.id

    const duplicate = await api('/api/admin/users', { cookie: admin, body: { email, name: 'Avery Quill', roles: ['technician'], password: 'first-password-1' } })
    expect(duplicate.status).toBe(409)

    const changed = await api(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, body: { roles: ['technician', 'inspector'], authorisationNumber: 'FMR-TI-0999' } })
    expect(changed.body.roles).toEqual(['technician', 'inspector'])

    expect((await api(`/api/admin/users/${id}/password`, { cookie: admin, body: { password: 'short' } })).status).toBe(400)
    expect((await api(`/api/admin/users/${id}/password`, { cookie: admin, body: { password: 'second-password-2' } })).status).toBe(200)
    expect((await api('/api/auth/login', { body: { email, password: 'first-password-1' } })).status).toBe(401)
    const newCookie = await signIn(email, 'second-password-2')
    expect((await api('/api/me', { cookie: newCookie })).status).toBe(200)

    expect((await api(`/api/admin/users/${id}`, { method: 'PATCH', cookie: admin, body: { disabled: true } })).status).toBe(200)
    // A disabled user cannot sign in, and an existing session stops working.
    expect((await api('/api/auth/login', { body: { email, password: 'second-password-2' } })).status).toBe(401)
    expect((await api('/api/me', { cookie: newCookie })).status).toBe(401)
  })

  it('lists users without password hashes', async () => {
    const answer = await api('/api/admin/users', { cookie: await signIn(DEMO.admin) })
    expect(answer.body.length).toBeGreaterThanOrEqual(5)
    expect(JSON.stringify(answer.body)).not.toMatch(/passwordHash|scrypt/)
  })

  it('will not let an admin disable themselves', async () => {
    const admin = await signIn(DEMO.admin)
    const me = await api('/api/me', { cookie: admin })
    const answer = await api(`/api/admin/users/${me.body.id}`, { method: 'PATCH', cookie: admin, body: { disabled: true } })
    expect(answer.status).toBe(403)
  })

  it('names the field for a bad role', async () => {
    const answer = await api('/api/admin/users', { cookie: await signIn(DEMO.admin), body: { email: 'x@chargewell.test', name: 'X Y', roles: ['pilot'], password: 'long-enough-pass' } })
    expect(answer.status).toBe(400)
    expect(answer.body.data.issues.map((issue: { field: string }) => issue.field)).toContain('roles.0')
  })
})

describe('preferences and health', () => {
  it('keeps unit preferences per user on the server', async () => {
    const cookie = await signIn(DEMO.engineer)
    const preferences = { pressureUnit: 'bar', temperatureUnit: 'F', volumeUnit: 'L', stationElevation: { value: 1200, unit: 'm' }, stationName: 'Skelby' }
    const saved = await api('/api/me/preferences', { method: 'PATCH', cookie, body: preferences })
    expect(saved.status).toBe(200)
    expect((await api('/api/me', { cookie })).body.preferences).toEqual(preferences)
    const bad = await api('/api/me/preferences', { method: 'PATCH', cookie, body: { ...preferences, stationElevation: { value: 20000, unit: 'm' } } })
    expect(bad.status).toBe(400)
    expect(bad.body.data.issues[0].field).toBe('stationElevation.value')
  })

  it('answers health without a session', async () => {
    const answer = await api('/api/health')
    expect(answer.body).toMatchObject({ status: 'ok', database: 'ok' })
  })
})
