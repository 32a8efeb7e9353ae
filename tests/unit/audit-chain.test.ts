import { createHash } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Sequelize } from 'sequelize'
import {
  appendAudit,
  auditHash,
  configureAuditSecret,
  establishSeal,
  GENESIS_HASH,
  verifyAuditChain,
} from '../../server/database/audit-chain'
import { openDatabase } from '../../server/database/connection'
import { migrate } from '../../server/database/migrate'
import { createWriteQueue, type WriteQueue } from '../../server/database/write-queue'

let sequelize: Sequelize
let write: WriteQueue
const folder = mkdtempSync(join(tmpdir(), 'chargewell-audit-'))

beforeAll(async () => {
  configureAuditSecret('unit-test secret')
  sequelize = await openDatabase(join(folder, 'audit.sqlite'))
  await migrate(sequelize)
  write = createWriteQueue(sequelize)
  await write(transaction => establishSeal(transaction))
  for (let index = 1; index <= 6; index++) {
    await write(transaction =>
      appendAudit(
        { actorId: null, entity: 'system', entityId: `job-${index}`, action: 'ran', detail: { index, note: 'ok' } },
        transaction,
      ),
    )
  }
})

afterAll(async () => {
  await sequelize.close()
  configureAuditSecret(null)
  rmSync(folder, { recursive: true, force: true })
})

describe('the hash-chained audit trail', () => {
  it('hashes an entry as SHA-256 of its canonical JSON form (the format the offline checker recomputes)', () => {
    const entry = {
      at: new Date('2026-01-02T03:04:05.678Z'),
      actorId: 7,
      entity: 'worksheet',
      entityId: '12',
      action: 'signed',
      detail: { b: 1, a: [true, null] },
      recordHash: 'ab'.repeat(32),
    }
    const text = JSON.stringify([
      2,
      GENESIS_HASH,
      '2026-01-02T03:04:05.678Z',
      7,
      'worksheet',
      '12',
      'signed',
      { a: [true, null], b: 1 },
      'ab'.repeat(32),
    ])
    expect(auditHash(entry, GENESIS_HASH, 2)).toBe(createHash('sha256').update(text).digest('hex'))
  })

  it('verifies an untouched, sealed chain', async () => {
    const report = await verifyAuditChain()
    expect(report).toMatchObject({
      ok: true,
      checked: 7,
      headProblems: [],
      mismatches: 0,
      head: { eventCount: 7, sealed: true, sealChecked: true },
    })
  })

  it('refuses updates and deletes through the model', async () => {
    const { AuditEvent } = await import('../../server/models')
    const event = await AuditEvent.findByPk(2)
    await expect(event!.update({ action: 'released' })).rejects.toThrow(/append-only/)
    await expect(event!.destroy()).rejects.toThrow(/append-only/)
  })

  it('serialises appends from many writers into one unforked chain', async () => {
    await Promise.all(
      Array.from({ length: 20 }, (_, index) =>
        write(transaction =>
          appendAudit(
            { actorId: null, entity: 'system', entityId: `burst-${index}`, action: 'ran', detail: {} },
            transaction,
          ),
        ),
      ),
    )
    expect(await verifyAuditChain()).toMatchObject({ ok: true, checked: 27 })
  })

  it('refuses a second successor to one entry in the database itself', async () => {
    const [[last]] = (await sequelize.query('SELECT previous_hash FROM audit_events ORDER BY id DESC LIMIT 1')) as [
      { previous_hash: string }[],
      unknown,
    ]
    await expect(
      sequelize.query(
        'INSERT INTO audit_events (at, entity, entity_id, action, detail, previous_hash, hash, hash_version) VALUES (\'2026-01-01 00:00:00.000 +00:00\', \'system\', \'fork\', \'x\', \'{}\', ?, ?, 2)',
        { replacements: [last!.previous_hash, 'f'.repeat(64)] },
      ),
    ).rejects.toMatchObject({ name: 'SequelizeUniqueConstraintError' })
  })

  it('reports the first tampered entry when someone edits the table directly', async () => {
    await sequelize.query(`UPDATE audit_events SET detail = '{"index":4,"note":"changed"}' WHERE id = 5`)
    const report = await verifyAuditChain()
    expect(report.ok).toBe(false)
    expect(report.firstBroken).toEqual({ id: 5, reason: 'its content does not match its hash' })
  })

  it('catches the newest entries deleted, by the sealed count', async () => {
    await sequelize.query('DELETE FROM audit_events WHERE id > 25')
    const report = await verifyAuditChain()
    expect(report.headProblems.join(' ')).toMatch(/counts 27 entries but 25 are present: entries were deleted/)
  })
})
