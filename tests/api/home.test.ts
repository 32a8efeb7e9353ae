/**
 * Home's work list per role, discarding a draft, and the audit view in words.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { fillWorksheet, unitAt } from '../support/worksheet-flow'

const cookies = {} as Record<keyof typeof DEMO, string>
beforeAll(async () => {
  for (const [name, email] of Object.entries(DEMO)) cookies[name as keyof typeof DEMO] = await signIn(email)
})

describe('what waits for each user', () => {
  it('a technician sees their drafts, returned work and work awaiting an inspector; an inspector the queue of others\' work', async () => {
    const before = (await api('/api/me/work', { cookie: cookies.technician })).body
    const unit = await unitAt(cookies.technician, 'QX-FMA', /Normal brake/)
    await fillWorksheet(cookies.technician, unit.id)
    const after = (await api('/api/me/work', { cookie: cookies.technician })).body
    expect(after.drafts.count).toBe(before.drafts.count + 1)
    expect(after.drafts.items[0]).toMatchObject({ registration: 'QX-FMA', state: 'draft' })
    expect(after.submitted.count).toBeGreaterThanOrEqual(3)
    expect(after.toCountersign).toBeUndefined()

    const inspector = (await api('/api/me/work', { cookie: cookies.inspector })).body
    expect(inspector.toCountersign.count).toBeGreaterThanOrEqual(3)
    expect(inspector.drafts).toBeUndefined()
    // The lead holds both roles: their own signed work is not in their countersign queue.
    const lead = (await api('/api/me/work', { cookie: cookies.lead })).body
    expect(
      lead.toCountersign.items.every(
        (item: { id: number }) => !lead.submitted.items.some((own: { id: number }) => own.id === item.id),
      ),
    ).toBe(true)
  })

  it('an engineer sees the open trend alerts; an admin the tools out of calibration', async () => {
    const engineer = (await api('/api/me/work', { cookie: cookies.engineer })).body
    expect(engineer.alerts.count).toBeGreaterThanOrEqual(1)
    expect(engineer.alerts.items.some((alert: { message: string }) => /QX-FMC/.test(alert.message))).toBe(true)
    const admin = (await api('/api/me/work', { cookie: cookies.admin })).body
    // GA-0098's calibration expired in the demo.
    expect(admin.tools.expired).toBeGreaterThanOrEqual(1)
    expect((await api('/api/me/work?extra=1', { cookie: cookies.admin })).status).toBe(400)
  })

  it('installed units carry the open alerts a technician must be told about', async () => {
    const leaking = await unitAt(cookies.technician, 'QX-FMC', /Normal brake/)
    const units = (await api('/api/accumulators?installed=true&pageSize=500', { cookie: cookies.technician })).body
      .items
    expect(units.find((unit: { id: number }) => unit.id === leaking.id).alerts.join(' ')).toMatch(/QX-FMC/)
  })
})

describe('discarding a draft', () => {
  it('the performer discards their own draft (kept, voided, with the reason); nobody else can; a signed one cannot be discarded', async () => {
    const unit = await unitAt(cookies.technician, 'QX-FMB', /Normal brake/)
    const flow = await fillWorksheet(cookies.technician, unit.id)
    expect((await api(`/api/worksheets/${flow.id}/discard`, { cookie: cookies.lead, body: {} })).status).toBe(403)
    expect((await api(`/api/worksheets/${flow.id}/discard`, { cookie: cookies.inspector, body: {} })).status).toBe(403)
    const discarded = await api(`/api/worksheets/${flow.id}/discard`, {
      cookie: cookies.technician,
      body: { reason: 'Started on the wrong unit.' },
    })
    expect(discarded.status).toBe(200)
    expect(discarded.body).toMatchObject({
      state: 'voided',
      voidReason: 'Discarded by the performer before signing: Started on the wrong unit.',
    })
    expect(
      (
        await api(`/api/worksheets/${flow.id}`, {
          method: 'PATCH',
          cookie: cookies.technician,
          body: { step: 'action', kind: 'none' },
        })
      ).status,
    ).toBe(409)
    expect((await api(`/api/worksheets/${flow.id}/discard`, { cookie: cookies.technician, body: {} })).status).toBe(409)
  })
})

describe('the audit view', () => {
  it('says in words who changed whose roles, and who disabled an account', async () => {
    const users = (await api('/api/admin/users', { cookie: cookies.admin })).body as {
      id: number
      email: string
      roles: string[]
    }[]
    const engineer = users.find(user => user.email === DEMO.engineer)!
    expect(
      (
        await api(`/api/admin/users/${engineer.id}`, {
          method: 'PATCH',
          cookie: cookies.admin,
          body: { roles: ['engineer', 'inspector'] },
        })
      ).status,
    ).toBe(200)
    const events = (await api('/api/audit/events?entity=user', { cookie: cookies.admin })).body.items as {
      actor: string
      text: string
      action: string
    }[]
    expect(events[0]).toMatchObject({
      actor: 'Nell Abara',
      action: 'roles-changed',
      text: 'changed the roles of Sol Varga from Engineer to Engineer, Inspector',
    })
    expect(
      (
        await api(`/api/admin/users/${engineer.id}`, {
          method: 'PATCH',
          cookie: cookies.admin,
          body: { roles: ['engineer'] },
        })
      ).status,
    ).toBe(200)
    // (Sol Varga's sessions ended with the role change.)
    expect((await api('/api/audit/events', { cookie: cookies.inspector })).status).toBe(403)
    expect((await api('/api/audit/events?entity=nothing', { cookie: cookies.admin })).status).toBe(400)
  })
})

describe('filter options come from the data', () => {
  it('lists the fleet\'s types and bases as the register holds them', async () => {
    const options = (await api('/api/aircraft/options', { cookie: cookies.technician })).body
    const aircraft = (await api('/api/aircraft?pageSize=500', { cookie: cookies.technician })).body.items as {
      type: string
      base: string
    }[]
    expect(options.types).toEqual([...new Set(aircraft.map(row => row.type))].sort())
    expect(options.bases).toEqual([...new Set(aircraft.map(row => row.base))].sort())
  })
})
