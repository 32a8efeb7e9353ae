/**
 * A database of the demo scenario grown to `count` worksheets for the scale benchmark: the
 * seeded year of released servicing, repeated back in time across the same fleet (each copy
 * shifted so every unit's history reads as a long, regular one), every copy with its two
 * signatures and an audit entry vouching for its content, chained and sealed like the server's.
 * Bulk inserts, not the app's routes: 100,000 worksheets take well under a minute this way.
 */
import { execFileSync } from 'node:child_process'
import type { Sequelize } from 'sequelize'
import { appendAudit, auditHash, configureAuditSecret, sealOf } from '../../server/database/audit-chain'
import { openDatabase } from '../../server/database/connection'
import { recordHashes } from '../../server/database/record-hash'
import { rebuildTrends } from '../../server/database/trend-store'
import { createWriteQueue } from '../../server/database/write-queue'
import { AuditEvent, AuditHead, Signature, Worksheet } from '../../server/models'

const DAY = 86_400_000
const BATCH = 1000

/** Moves every ISO time stamp inside a worksheet's content by `offset` milliseconds. */
function shifted(content: unknown, offset: number): unknown {
  return JSON.parse(JSON.stringify(content), (_key, value) =>
    typeof value === 'string' && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z$/.test(value)
      ? new Date(Date.parse(value) + offset).toISOString()
      : value,
  )
}

export async function buildScaleDatabase(
  path: string,
  count: number,
  secret: string,
  log = (line: string) => console.log(line),
): Promise<void> {
  // The demo scenario first, seeded by the built server's own task (scripts/task.mjs).
  execFileSync(process.execPath, ['scripts/task.mjs', 'db:seed'], {
    stdio: 'inherit', env: { ...process.env, NUXT_DB_PATH: path, NUXT_DATABASE_URL: '', NUXT_SESSION_PASSWORD: secret, NUXT_AUDIT_SECRET: '' },
  })
  configureAuditSecret(`session:${secret}`)
  const sequelize: Sequelize = await openDatabase(path)
  try {
    const templates = await Worksheet.findAll({
      where: { state: 'released' },
      order: [['performedAt', 'ASC']],
      include: [{ model: Signature, as: 'signatures' }],
    })
    const existing = await Worksheet.count()
    const toAdd = Math.max(0, count - existing)
    let nextId = (await Worksheet.max<number, Worksheet>('id'))! + 1
    let nextSignatureId = (await Signature.max<number, Signature>('id'))! + 1
    const span = templates.at(-1)!.performedAt!.getTime() - templates[0]!.performedAt!.getTime() + 60 * DAY
    const started = Date.now()
    for (let done = 0; done < toAdd; done += BATCH) {
      const size = Math.min(BATCH, toAdd - done)
      const worksheets: Record<string, unknown>[] = []
      const signatures: Record<string, unknown>[] = []
      for (let index = 0; index < size; index++) {
        const copy = done + index
        const template = templates[copy % templates.length]!
        // Copy n of a template lies n/templates.length whole spans before it.
        const offset = -(Math.floor(copy / templates.length) + 1) * span
        const id = nextId++
        const at = (date: Date | null) => (date ? new Date(date.getTime() + offset) : null)
        worksheets.push({
          ...template.get({ plain: true }),
          id,
          signatures: undefined,
          workOrder: `WO-H-${String(copy).padStart(6, '0')}`,
          content: shifted(template.content, offset),
          performedAt: at(template.performedAt),
          submittedAt: at(template.submittedAt),
          releasedAt: at(template.releasedAt),
          createdAt: at(template.createdAt),
          updatedAt: at(template.updatedAt),
          version: 1,
          round: 1,
        })
        for (const signature of template.signatures ?? []) {
          signatures.push({
            ...signature.get({ plain: true }),
            id: nextSignatureId++,
            worksheetId: id,
            signedAt: at(signature.signedAt),
          })
        }
      }
      await createWriteQueue(sequelize)(async (transaction) => {
        await Worksheet.bulkCreate(worksheets as never[], { transaction })
        await Signature.bulkCreate(signatures as never[], { transaction })
        const ids = worksheets.map(row => row.id as number)
        const hashes = await recordHashes('worksheet', ids, transaction)
        const head = (await AuditHead.findByPk(1, { transaction }))!
        let previous = head.lastHash
        const events = worksheets.map((row) => {
          const entry = {
            at: row.releasedAt as Date,
            actorId: null,
            entity: 'worksheet',
            entityId: String(row.id),
            action: 'released',
            detail: { history: true },
            recordHash: hashes.get(row.id as number)!,
          }
          const hash = auditHash(entry, previous, 2)
          const event = { ...entry, previousHash: previous, hash, hashVersion: 2 }
          previous = hash
          return event
        })
        const created = await AuditEvent.bulkCreate(events, { transaction })
        const lastEventId = created.at(-1)?.id ?? (await AuditEvent.max<number, AuditEvent>('id', { transaction }))
        const next = { eventCount: head.eventCount + events.length, lastEventId, lastHash: previous }
        await head.update({ ...next, seal: sealOf(next), sealedAt: new Date() }, { transaction })
      })
      if ((done / BATCH) % 20 === 0)
        log(`  ${existing + done + size} worksheets (${((Date.now() - started) / 1000).toFixed(0)} s)`)
    }
    await createWriteQueue(sequelize)(transaction =>
      appendAudit(
        { actorId: null, entity: 'system', entityId: 'bench', action: 'history-added', detail: { worksheets: toAdd } },
        transaction,
      ),
    )
    log('Deriving the stored pre-charge trends…')
    await rebuildTrends(createWriteQueue(sequelize), log)
    await sequelize.query('PRAGMA wal_checkpoint(TRUNCATE)')
    await sequelize.query('ANALYZE')
  }
  finally {
    await sequelize.close()
  }
}
