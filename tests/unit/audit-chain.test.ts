import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Sequelize } from 'sequelize'
import { appendAudit, verifyAuditChain } from '../../server/database/audit-chain'
import { openDatabase } from '../../server/database/connection'
import { migrate } from '../../server/database/migrate'

let sequelize: Sequelize
const folder = mkdtempSync(join(tmpdir(), 'chargewell-audit-'))

beforeAll(async () => {
  sequelize = await openDatabase(join(folder, 'audit.sqlite'))
  await migrate(sequelize)
  for (let index = 1; index <= 6; index++) {
    await appendAudit({ actorId: null, entity: 'worksheet', entityId: String(index), action: 'signed', detail: { index, note: 'ok' } })
  }
})

afterAll(async () => {
  await sequelize.close()
  rmSync(folder, { recursive: true, force: true })
})

describe('the hash-chained audit trail', () => {
  it('verifies an untouched chain', async () => {
    expect(await verifyAuditChain()).toEqual({ ok: true, checked: 6 })
  })

  it('refuses updates and deletes through the model', async () => {
    const { AuditEvent } = await import('../../server/models')
    const event = await AuditEvent.findByPk(2)
    await expect(event!.update({ action: 'released' })).rejects.toThrow(/append-only/)
    await expect(event!.destroy()).rejects.toThrow(/append-only/)
  })

  it('reports the first tampered row when someone edits the table directly', async () => {
    await sequelize.query(`UPDATE audit_events SET detail = '{"index":4,"note":"changed"}' WHERE id = 4`)
    const report = await verifyAuditChain()
    expect(report.ok).toBe(false)
    expect(report.firstBroken).toEqual({ id: 4, reason: 'its content does not match its hash' })
  })

  it('reports a deleted row as a broken link', async () => {
    await sequelize.query('UPDATE audit_events SET detail = \'{"index":4,"note":"ok"}\' WHERE id = 4')
    expect((await verifyAuditChain()).ok).toBe(true)
    await sequelize.query('DELETE FROM audit_events WHERE id = 3')
    expect((await verifyAuditChain()).firstBroken).toEqual({ id: 4, reason: 'does not link to entry 2' })
  })
})
