/**
 * Separation of duties in the rules, not only in the abilities table: nobody grants themselves a role
 * or an authorisation, nobody voids their own work, and a released record is never voided (a
 * correction supersedes it) — whoever asks.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { sql } from '../support/database'
import { fileDatabase } from '../support/file-server'
import { fillWorksheet, finishAndSign, unitAt } from '../support/worksheet-flow'

const cookies = {} as Record<keyof typeof DEMO, string>
const idOf = async (email: string) =>
  (await sql<{ id: number }>(fileDatabase(), 'SELECT id FROM users WHERE email = ?', [email]))[0]!.id
beforeAll(async () => {
  for (const [name, email] of Object.entries(DEMO)) cookies[name as keyof typeof DEMO] = await signIn(email)
})

describe('nobody changes their own authority', () => {
  it('an admin cannot grant themselves the inspector role or a new authorisation number; another admin can', async () => {
    const adminId = await idOf(DEMO.admin)
    const me = (await api('/api/admin/users', { cookie: cookies.admin })).body.find((user: { id: number }) => user.id === adminId)
    const grant = await api(`/api/admin/users/${adminId}`, { method: 'PATCH', cookie: cookies.admin, body: { roles: [...me.roles, 'inspector'] } })
    expect(grant.status).toBe(403)
    expect(grant.body.message).toMatch(/another administrator must/)
    const number = await api(`/api/admin/users/${adminId}`, { method: 'PATCH', cookie: cookies.admin, body: { authorisationNumber: 'FMR-I-9999' } })
    expect(number.status).toBe(403)
    const countersign = await api('/api/worksheets?state=awaiting-countersign&pageSize=1', { cookie: cookies.admin })
    const id = countersign.body.items[0].id
    expect((await api(`/api/worksheets/${id}/countersign`, { cookie: cookies.admin, body: { password: DEMO_PASSWORD, certify: true } })).status).toBe(403)
  })
})

describe('nobody voids their own work, and nobody voids a released record', () => {
  it('a technician-inspector cannot void their own signed worksheet', async () => {
    const unit = await unitAt(cookies.lead, 'QX-FMA', /Normal brake/)
    const flow = await fillWorksheet(cookies.lead, unit.id)
    await finishAndSign(cookies.lead, flow)
    const own = await api(`/api/worksheets/${flow.id}/void`, { cookie: cookies.lead, body: { reason: 'I would rather it went away.' } })
    expect(own.status).toBe(403)
    expect(own.body.message).toMatch(/cannot void work you performed/)
    // Another inspector may void it while it awaits countersign.
    expect((await api(`/api/worksheets/${flow.id}/void`, { cookie: cookies.inspector, body: { reason: 'Raised against the wrong work order.' } })).status).toBe(200)
  })

  it('an admin who is not an inspector, and an inspector, are both refused a released record; a correction supersedes it', async () => {
    const [row] = await sql<{ id: number }>(fileDatabase(), 'SELECT id FROM worksheets WHERE state = ? ORDER BY id DESC LIMIT 1', ['released'])
    for (const cookie of [cookies.admin, cookies.inspector, cookies.lead]) {
      const answer = await api(`/api/worksheets/${row!.id}/void`, { cookie, body: { reason: 'Wrong unit on the record.' } })
      expect(answer.status).toBe(409)
      expect(answer.body.message).toMatch(/never voided/)
    }
    expect((await api(`/api/worksheets/${row!.id}`, { cookie: cookies.admin })).body.state).toBe('released')
  })
})
