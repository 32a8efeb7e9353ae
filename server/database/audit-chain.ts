import { createHash } from 'node:crypto'
import type { Transaction } from 'sequelize'
import { AuditEvent } from '../models'

export const GENESIS_HASH = '0'.repeat(64)

interface AuditFields {
  at: Date
  actorId: number | null
  entity: string
  entityId: string
  action: string
  detail: Record<string, unknown>
}

/** SHA-256 over the previous hash and a canonical form of the entry. */
export function auditHash(fields: AuditFields, previousHash: string): string {
  const canonical = JSON.stringify([
    previousHash, fields.at.toISOString(), fields.actorId, fields.entity, fields.entityId, fields.action, sortKeys(fields.detail),
  ])
  return createHash('sha256').update(canonical).digest('hex')
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys)
  if (value && typeof value === 'object') {
    return Object.fromEntries(Object.keys(value).sort().map(key => [key, sortKeys((value as Record<string, unknown>)[key])]))
  }
  return value
}

/** Appends one entry to the chain, inside the caller's transaction when given. */
export async function appendAudit(fields: Omit<AuditFields, 'at'> & { at?: Date }, transaction?: Transaction): Promise<AuditEvent> {
  const last = await AuditEvent.findOne({ order: [['id', 'DESC']], transaction })
  const previousHash = last?.hash ?? GENESIS_HASH
  const entry = { ...fields, at: fields.at ?? new Date() }
  // Millisecond precision is what the database keeps; hash what will be read back.
  entry.at = new Date(Math.floor(entry.at.getTime()))
  return AuditEvent.create({ ...entry, previousHash, hash: auditHash(entry, previousHash) }, { transaction })
}

export interface ChainReport {
  ok: boolean
  checked: number
  /** The first entry whose stored hash or link does not match. */
  firstBroken?: { id: number, reason: string }
}

/** Walks the chain from the start and reports the first broken link. */
export async function verifyAuditChain(): Promise<ChainReport> {
  let previousHash = GENESIS_HASH
  let checked = 0
  let lastId = 0
  for (;;) {
    const batch = await AuditEvent.findAll({ where: {}, order: [['id', 'ASC']], limit: 500, offset: checked })
    if (batch.length === 0) break
    for (const event of batch) {
      if (event.previousHash !== previousHash) return { ok: false, checked, firstBroken: { id: event.id, reason: `does not link to entry ${lastId}` } }
      const expected = auditHash(event, previousHash)
      if (expected !== event.hash) return { ok: false, checked, firstBroken: { id: event.id, reason: 'its content does not match its hash' } }
      previousHash = event.hash
      lastId = event.id
      checked++
    }
  }
  return { ok: true, checked }
}
