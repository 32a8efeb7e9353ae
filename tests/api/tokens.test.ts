/**
 * API tokens: another system calls the API with a bearer token, within the token's scopes and its user's
 * roles; shown once, stored hashed, revocable, expiring, rate-limited per token, every use audited.
 */
import { createHash } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { sql } from '../support/database'
import { baseURL, fileDatabase } from '../support/file-server'

const cookies: Record<string, string> = {}
beforeAll(async () => {
  for (const role of ['technician', 'admin', 'engineer'] as const) cookies[role] = await signIn(DEMO[role])
})

const CHARGE_TARGET = {
  reference: { pressure: { value: 1000, unit: 'psi', basis: 'gauge' }, temperature: { value: 21, unit: 'C' } },
  gasTemperature: { value: 5, unit: 'C' },
  tolerance: { minus: 50, plus: 50, unit: 'psi' },
}

function bearer(token: string, path: string, body?: unknown) {
  return fetch(`${baseURL()}${path}`, {
    method: body === undefined ? 'GET' : 'POST',
    headers: { authorization: `Bearer ${token}`, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
}

async function issue(cookie: string, body: object, path = '/api/me/tokens') {
  const answer = await api(path, { cookie, body })
  expect(answer.status, JSON.stringify(answer.body)).toBe(201)
  return answer.body as { id: number, token: string, prefix: string, scopes: string[] }
}

describe('API tokens', () => {
  it('work within their scopes and their user\'s roles; are shown once and stored hashed', async () => {
    const calc = await issue(cookies.technician!, { name: 'Planning system', scopes: ['calculations'], expiresInDays: 30 })
    expect(calc.token).toMatch(/^cw_[\w-]{40,}$/)
    const answered = await bearer(calc.token, '/api/calc/charge-target', CHARGE_TARGET)
    expect(answered.status, await answered.clone().text()).toBe(200)
    // Not its scope: refused in words naming the scope that would allow it.
    const records = await bearer(calc.token, '/api/worksheets')
    expect(records.status).toBe(403)
    expect((await records.json()).message).toMatch(/do not include read-records/)
    // Nor anything a token may never do (an account's own settings, signing).
    expect((await bearer(calc.token, '/api/me')).status).toBe(403)

    const reader = await issue(cookies.technician!, { name: 'Records office', scopes: ['read-records'] })
    const list = await bearer(reader.token, '/api/worksheets?pageSize=5')
    expect(list.status).toBe(200)
    expect((await list.json()).items.length).toBe(5)
    // Scoped to import registers, a technician's token still cannot: the user's roles bound it.
    const importer = await issue(cookies.technician!, { name: 'Spreadsheet', scopes: ['import-registers'] })
    const refused = await fetch(`${baseURL()}/api/tools/import`, {
      method: 'POST',
      headers: { 'authorization': `Bearer ${importer.token}`, 'content-type': 'text/csv' },
      body: 'kind,assetNumber,description\ncart,NC-99,Test\n',
    })
    expect(refused.status).toBe(403)

    const listed = (await api('/api/me/tokens', { cookie: cookies.technician })).body as { id: number, prefix: string, lastUsedAt: string | null }[]
    expect(JSON.stringify(listed)).not.toContain(calc.token)
    expect(listed.find(token => token.id === calc.id)!.lastUsedAt).not.toBeNull()
    const [stored] = await sql<{ token_hash: string }>(fileDatabase(), 'SELECT token_hash FROM api_tokens WHERE id = ?', [calc.id])
    expect(stored!.token_hash).toBe(createHash('sha256').update(calc.token).digest('hex'))
    // Every use is in the audit trail.
    const [uses] = await sql<{ n: number | string }>(fileDatabase(), 'SELECT COUNT(*) AS n FROM audit_events WHERE entity = ? AND entity_id = ? AND action = ?', ['api-token', String(calc.id), 'used'])
    expect(Number(uses!.n)).toBe(1)
  })

  it('refuses a revoked, an expired and an unknown token, and one whose user is disabled', async () => {
    const token = await issue(cookies.engineer!, { name: 'Trend dashboard', scopes: ['read-records'] })
    expect((await bearer(token.token, '/api/trends/precharge')).status).toBe(200)
    expect((await api(`/api/me/tokens/${token.id}/revoke`, { cookie: cookies.engineer, body: {} })).status).toBe(200)
    const revoked = await bearer(token.token, '/api/trends/precharge')
    expect(revoked.status).toBe(401)
    expect((await revoked.json()).message).toMatch(/was revoked on/)
    // Nobody revokes another's token from their own account.
    expect((await api(`/api/me/tokens/${token.id}/revoke`, { cookie: cookies.technician, body: {} })).status).toBe(404)

    const expiring = await issue(cookies.engineer!, { name: 'Old system', scopes: ['read-records'], expiresInDays: 1 })
    await sql(fileDatabase(), 'UPDATE api_tokens SET expires_at = ? WHERE id = ?', ['2020-01-01 00:00:00.000 +00:00', expiring.id])
    const expired = await bearer(expiring.token, '/api/trends/precharge')
    expect(expired.status).toBe(401)
    expect((await expired.json()).message).toMatch(/expired on 2020-01-01/)
    expect((await bearer('cw_not-a-token', '/api/trends/precharge')).status).toBe(401)

    const invalid = await api('/api/me/tokens', { cookie: cookies.engineer, body: { name: 'x', scopes: [], expiresInDays: 999 } })
    expect(invalid.status).toBe(400)
    expect(invalid.body.data.issues.map((issue: { field: string }) => issue.field).sort()).toEqual(['expiresInDays', 'name', 'scopes'])
  })

  it('an administrator issues a service token for a system\'s account, lists every token and revokes one', async () => {
    const users = (await api('/api/admin/users', { cookie: cookies.admin })).body as { id: number, email: string }[]
    const engineer = users.find(user => user.email === DEMO.engineer)!
    const service = await issue(cookies.admin!, { name: 'Maintenance tracking', scopes: ['read-records', 'write-cycle-checks'] }, `/api/admin/users/${engineer.id}/tokens`)
    expect((await bearer(service.token, '/api/cycle-checks')).status).toBe(200)
    const all = (await api('/api/admin/tokens', { cookie: cookies.admin })).body as { id: number, userName: string }[]
    expect(all.find(token => token.id === service.id)!.userName).toBe('Sol Varga')
    expect((await api(`/api/admin/tokens/${service.id}/revoke`, { cookie: cookies.admin, body: {} })).status).toBe(200)
    expect((await bearer(service.token, '/api/cycle-checks')).status).toBe(401)
    expect((await api('/api/admin/tokens', { cookie: cookies.engineer })).status).toBe(403)
  })

  it('is rate-limited per token: of 140 parallel requests 120 are answered, the rest 429; another token is unaffected', async () => {
    const busy = await issue(cookies.technician!, { name: 'Busy system', scopes: ['calculations'] })
    const quiet = await issue(cookies.technician!, { name: 'Quiet system', scopes: ['calculations'] })
    const statuses = await Promise.all(Array.from({ length: 140 }, () => bearer(busy.token, '/api/calc/charge-target', CHARGE_TARGET).then(response => response.status)))
    expect(statuses.filter(status => status === 200)).toHaveLength(120)
    expect(statuses.filter(status => status === 429)).toHaveLength(20)
    expect((await bearer(quiet.token, '/api/calc/charge-target', CHARGE_TARGET)).status).toBe(200)
  })
})
