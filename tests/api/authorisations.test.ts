/**
 * Certifying authorisations as a register that signing checks: refusals in words for a unit out of
 * scope, an expired and a suspended authorisation; the signature freezes the one it was made under; a
 * countersign racing an administrator's suspension is ordered, never both; holders and administrators
 * are mailed 30 days before expiry.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { stationDate } from '../../shared/utils/station-time'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { asText, sql } from '../support/database'
import { fileDatabase } from '../support/file-server'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

const cookies: Record<string, string> = {}
const register = async () => (await api('/api/admin/authorisations', { cookie: cookies.admin })).body as { id: number, number: string }[]
const idOf = async (number: string) => (await register()).find(entry => entry.number === number)!.id
const dayOffset = (days: number) => {
  const date = new Date()
  date.setUTCDate(date.getUTCDate() + days)
  return stationDate('UTC', date)
}

async function readyToSign(registration: string, position: RegExp): Promise<number> {
  const unit = await unitAt(cookies.technician!, registration, position)
  const flow = await fillWorksheet(cookies.technician!, unit.id)
  await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
  await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
  return flow.id
}
const sign = (id: number) => api(`/api/worksheets/${id}/sign`, { cookie: cookies.technician, body: { certify: true, password: DEMO_PASSWORD } })
const countersign = (id: number) => api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: { certify: true, password: DEMO_PASSWORD } })

beforeAll(async () => {
  for (const role of ['technician', 'inspector', 'admin'] as const) cookies[role] = await signIn(DEMO[role])
})

describe('the register of certifying authorisations', () => {
  it('lists each entry with its standing; each holder sees their own', async () => {
    const entries = await register()
    expect(entries.map(entry => entry.number)).toEqual(['FMR-I-0107', 'FMR-I-0122', 'FMR-T-0412', 'FMR-T-0519', 'FMR-TI-0033'])
    const mine = (await api('/api/me/authorisations', { cookie: cookies.technician })).body
    expect(mine).toHaveLength(1)
    expect(mine[0]).toMatchObject({ number: 'FMR-T-0412', privileges: 'perform', standing: 'valid', scope: ['Tarnwing 46', 'Tarnwing 72'] })
  })

  it('refuses bad entries naming the field; a number is entered once', async () => {
    const holderId = (await api('/api/me', { cookie: cookies.technician })).body.id
    const base = { holderId, number: 'FMR-T-0999', privileges: 'perform', scopeKind: 'part-numbers', scope: ['FA-2210'], issuedOn: '2026-01-01', expiresOn: '2027-01-01', issuingBody: 'Fellmoor Regional Quality Department' }
    const backwards = await api('/api/admin/authorisations', { cookie: cookies.admin, body: { ...base, expiresOn: '2025-12-31' } })
    expect(backwards.status).toBe(400)
    expect(JSON.stringify(backwards.body)).toContain('It cannot expire before it is issued.')
    const badDate = await api('/api/admin/authorisations', { cookie: cookies.admin, body: { ...base, issuedOn: '2026-02-30' } })
    expect(badDate.status).toBe(400)
    expect(JSON.stringify(badDate.body)).toContain('The issue date is not a real date.')
    const twice = await api('/api/admin/authorisations', { cookie: cookies.admin, body: { ...base, number: 'FMR-T-0412' } })
    expect(twice.status).toBe(409)
    expect(twice.body.data.field).toBe('number')
    expect((await api('/api/admin/authorisations', { cookie: cookies.technician, body: base })).status).toBe(403)
  })

  it('signing refuses a unit out of scope, an expired and a suspended authorisation, in words; the record freezes the one used', async () => {
    const id = await readyToSign('QX-FMB', /Emergency brake/)
    const technicianKey = await idOf('FMR-T-0412')
    const scoped = await api(`/api/admin/authorisations/${technicianKey}`, { method: 'PATCH', cookie: cookies.admin, body: { scopeKind: 'part-numbers', scope: ['FA-2210', 'FA-2240'] } })
    expect(scoped.status).toBe(200)
    const outOfScope = await sign(id)
    expect(outOfScope.status).toBe(403)
    expect(outOfScope.body.message).toBe('Your authorisation FMR-T-0412 does not cover FA-2260-02 units. The signature was not made.')
    // The signing form hears it before anyone taps a passkey.
    const options = await api(`/api/worksheets/${id}/signing-options?capacity=performer`, { cookie: cookies.technician })
    expect(options.status).toBe(403)
    expect(options.body.message).toMatch(/does not cover FA-2260-02 units/)

    await api(`/api/admin/authorisations/${technicianKey}`, { method: 'PATCH', cookie: cookies.admin, body: { scope: ['FA-2210', 'FA-2240', 'FA-2260'], expiresOn: dayOffset(-1) } })
    const expired = await sign(id)
    expect(expired.status).toBe(403)
    expect(expired.body.message).toBe(`Your authorisation FMR-T-0412 expired on ${dayOffset(-1)}. The signature was not made.`)

    await api(`/api/admin/authorisations/${technicianKey}`, { method: 'PATCH', cookie: cookies.admin, body: { expiresOn: '2028-01-14' } })
    expect((await api(`/api/admin/authorisations/${technicianKey}/suspend`, { cookie: cookies.admin, body: { reason: 'Recurrent training overdue' } })).status).toBe(200)
    const suspended = await sign(id)
    expect(suspended.status).toBe(403)
    expect(suspended.body.message).toBe('Your authorisation FMR-T-0412 is suspended: Recurrent training overdue. The signature was not made.')
    expect((await api(`/api/worksheets/${id}`, { cookie: cookies.technician })).body.state).toBe('draft')

    expect((await api(`/api/admin/authorisations/${technicianKey}/reinstate`, { method: 'POST', cookie: cookies.admin })).body.standing).toBe('valid')
    const signed = await sign(id)
    expect(signed.status).toBe(200)
    expect(signed.body.signatures[0]).toMatchObject({ authorisationNumber: 'FMR-T-0412' })
    const [row] = await sql<{ authorisation: unknown }>(fileDatabase(), 'SELECT authorisation FROM signatures WHERE worksheet_id = ?', [id])
    expect(JSON.parse(asText(row!.authorisation))).toMatchObject({ number: 'FMR-T-0412', privileges: 'perform', scope: ['FA-2210', 'FA-2240', 'FA-2260'], expiresOn: '2028-01-14' })
    const trail = await sql<{ action: string }>(fileDatabase(), 'SELECT action FROM audit_events WHERE entity = ? ORDER BY id', ['authorisation'])
    expect(trail.map(event => event.action)).toEqual(['authorisation-changed', 'authorisation-changed', 'authorisation-changed', 'authorisation-suspended', 'authorisation-reinstated'])
  })

  it('a countersign racing a suspension: each pair is ordered — signed before the suspension, or refused after it', async () => {
    const inspectorKey = await idOf('FMR-I-0107')
    const outcomes: string[] = []
    for (const position of [/Main hydraulic/, /Normal brake/, /Emergency brake/]) {
      for (const registration of ['QX-FMA', 'QX-FMC']) {
        const id = await readyToSign(registration, position)
        expect((await sign(id)).status).toBe(200)
        await api(`/api/admin/authorisations/${inspectorKey}/reinstate`, { method: 'POST', cookie: cookies.admin })
        const [signed, suspension] = await Promise.all([
          countersign(id),
          api(`/api/admin/authorisations/${inspectorKey}/suspend`, { cookie: cookies.admin, body: { reason: `Audit finding ${id}` } }),
        ])
        expect(suspension.status).toBe(200)
        const state = (await api(`/api/worksheets/${id}`, { cookie: cookies.inspector })).body
        if (signed.status === 200) {
          const inspectorSignature = state.signatures
            .find((signature: { capacity: string }) => signature.capacity === 'inspector')
          const [signedAt, suspendedAt] = [inspectorSignature.signedAt, suspension.body.suspendedAt]
          expect(new Date(signedAt).getTime()).toBeLessThanOrEqual(new Date(suspendedAt).getTime())
          expect(state.state).toBe('released')
          outcomes.push('signed first')
        }
        else {
          expect(signed.status).toBe(403)
          expect(signed.body.message).toMatch(new RegExp(`FMR-I-0107 is suspended: Audit finding ${id}`))
          expect(state.state).toBe('awaiting-countersign')
          outcomes.push('refused')
        }
      }
    }
    expect(outcomes).toHaveLength(6)
    await api(`/api/admin/authorisations/${inspectorKey}/reinstate`, { method: 'POST', cookie: cookies.admin })
  })

  it('holders and administrators are mailed 30 days before expiry, once', async () => {
    const holderId = (await api('/api/me', { cookie: cookies.inspector })).body.id
    const created = await api('/api/admin/authorisations', {
      cookie: cookies.admin,
      body: { holderId, number: 'FMR-I-0200', privileges: 'inspect', scopeKind: 'aircraft-types', scope: ['Tarnwing 72'], issuedOn: '2025-06-01', expiresOn: dayOffset(20), issuingBody: 'Fellmoor Regional Quality Department' },
    })
    expect(created.status).toBe(201)
    const outbox = async () => (await api('/api/admin/outbox', { cookie: cookies.admin })).body
    const notices = async () => ((await outbox()).notifications as { recipient: string, subject: string }[])
      .filter(mail => mail.subject === `Authorisation FMR-I-0200 of Imke Dorsey expires on ${dayOffset(20)}`)
    const recipients = async () => (await notices()).map(mail => mail.recipient).sort()
    await expect.poll(recipients).toEqual([DEMO.admin, DEMO.inspector].sort())
    // A later change that does not move the expiry sends nothing again.
    await api(`/api/admin/authorisations/${created.body.id}`, { method: 'PATCH', cookie: cookies.admin, body: { issuingBody: 'Fellmoor Regional Quality' } })
    expect(await notices()).toHaveLength(2)
  })
})
