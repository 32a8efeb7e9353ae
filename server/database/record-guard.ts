import { createError } from 'h3'
import type { Model, ModelStatic, Transaction, WhereOptions } from 'sequelize'
import { QueryTypes } from 'sequelize'
import { AuditEvent } from '../models'
import { RECORD_KINDS, recordHash, type RecordKindName } from './record-hash'
import { activeTransaction, outsideTransaction } from './write-queue'

/**
 * No write launders a tamper. Before a write touches a record the audit trail vouches for (the
 * record's own row or one of its child rows), the record's stored content is hashed and compared
 * with the hash of its newest audit entry. If they differ, the record was changed behind
 * Chargewell's back since its last audited write: the write is refused (409, in words), the record
 * is held until an administrator has looked at it, and the administrators are told (through the
 * listener set with `onRecordHeld`: the news goes up by a hook, not an import). `appendAudit` asks
 * the same before it vouches for a record, so an entry written without a row change cannot
 * launder either. A record is checked once per transaction: after the first check, this
 * transaction's own changes are what the next entry vouches for.
 */

export interface HeldRecord {
  entity: RecordKindName
  entityId: string
  /** The newest entry that vouches for the record (null: none ever did). */
  eventId: number | null
  reason: string
}

let heldListener: ((held: HeldRecord) => void) | undefined
/** Who is told when a write is refused because a record was changed outside Chargewell. */
export function onRecordHeld(listener: (held: HeldRecord) => void): void {
  heldListener = listener
}

const checked = new WeakMap<Transaction, Set<string>>()
function checkedIn(transaction: Transaction): Set<string> {
  let keys = checked.get(transaction)
  if (!keys) checked.set(transaction, (keys = new Set()))
  return keys
}

/** The newest audit entry vouching for a record's content. */
export async function lastVouched(
  kind: RecordKindName,
  id: number,
  transaction?: Transaction,
): Promise<{ eventId: number, recordHash: string } | null> {
  const [row] = await AuditEvent.sequelize!.query<{ id: number, record_hash: string }>(
    'SELECT id, record_hash FROM audit_events WHERE entity = :entity AND entity_id = :entityId '
    + 'AND hash_version = 2 AND record_hash IS NOT NULL ORDER BY id DESC LIMIT 1',
    { replacements: { entity: kind, entityId: String(id) }, type: QueryTypes.SELECT, transaction },
  )
  return row ? { eventId: Number(row.id), recordHash: row.record_hash } : null
}

const LABELS: Record<RecordKindName, string> = {
  'worksheet': 'Worksheet',
  'specification': 'Specification',
  'tool': 'Tool',
  'user': 'User',
  'aircraft': 'Aircraft',
  'accumulator': 'Accumulator',
  'cycle-check': 'Cycle check',
}

/**
 * Refuses the write in progress when the record's stored content is not what the trail last
 * vouched for. `created`: the record was made in this transaction (nothing to compare yet).
 */
export async function guardRecord(kind: RecordKindName, id: number, transaction = activeTransaction()): Promise<void> {
  const key = `${kind}:${id}`
  const keys = transaction ? checkedIn(transaction) : new Set<string>()
  if (keys.has(key)) return
  keys.add(key)
  const current = await recordHash(kind, id, transaction)
  // A row that is not there (yet, or any more) has nothing to launder: the write itself will say so.
  if (current === null) return
  const vouched = await lastVouched(kind, id, transaction)
  if (vouched?.recordHash === current) return
  const reason = vouched
    ? `${LABELS[kind]} ${id} was changed outside Chargewell after audit entry ${vouched.eventId} vouched for it.`
    : `${LABELS[kind]} ${id} has no audit entry vouching for its content: it was written outside Chargewell.`
  const held: HeldRecord = { entity: kind, entityId: String(id), eventId: vouched?.eventId ?? null, reason }
  if (heldListener) outsideTransaction(() => setImmediate(() => heldListener?.(held)))
  throw createError({
    status: 409,
    statusMessage: 'Conflict',
    message:
      `${reason} Nothing was changed: the record is held until an administrator has checked it `
      + '(Admin → Audit trail).',
    data: { integrity: held },
  })
}

/** A record made in this transaction: its later writes here need no comparison. */
function markCreated(kind: RecordKindName, id: number, transaction = activeTransaction()): void {
  if (transaction) checkedIn(transaction).add(`${kind}:${id}`)
}

interface HookOptions {
  where?: WhereOptions
  transaction?: Transaction | null
}

/** The ids a bulk update or destroy will touch, read in its transaction. */
async function idsOf(model: ModelStatic<Model>, options: HookOptions, column = 'id'): Promise<number[]> {
  const where = options.where as Record<string, unknown> | undefined
  const direct = where && Object.keys(where).length === 1 ? where[column] : undefined
  if (typeof direct === 'number') return [direct]
  const rows = await model.findAll({
    attributes: [column],
    where: options.where ?? {},
    transaction: options.transaction ?? activeTransaction(),
    raw: true,
  })
  return [...new Set(rows.map(row => Number((row as unknown as Record<string, unknown>)[column])))]
}

/**
 * Installs the guard on every model the trail vouches for: the record's own row (update, destroy)
 * and its child rows (create, update, destroy: signatures, attachments, installations, table points).
 */
export function installRecordGuards(): void {
  for (const kind of Object.keys(RECORD_KINDS) as RecordKindName[]) {
    const definition = RECORD_KINDS[kind]
    const model = definition.model
    const guardIds = async (ids: number[], options: HookOptions) => {
      for (const id of ids) await guardRecord(kind, id, options.transaction ?? undefined)
    }
    model.addHook('afterCreate', 'record-guard', (row: Model, options: HookOptions) =>
      markCreated(kind, row.get('id') as number, options.transaction ?? undefined))
    model.addHook('beforeUpdate', 'record-guard', (row: Model, options: HookOptions) =>
      guardIds([row.get('id') as number], options))
    model.addHook('beforeDestroy', 'record-guard', (row: Model, options: HookOptions) =>
      guardIds([row.get('id') as number], options))
    model.addHook('beforeBulkUpdate', 'record-guard', async (options: HookOptions) =>
      guardIds(await idsOf(model, options), options))
    model.addHook('beforeBulkDestroy', 'record-guard', async (options: HookOptions) =>
      guardIds(await idsOf(model, options), options))
    for (const child of definition.children) {
      const parentOf = (row: Model) => Number(row.get(child.foreignKey))
      for (const hook of ['beforeCreate', 'beforeUpdate', 'beforeDestroy'] as const)
        child.model.addHook(hook, 'record-guard', (row: Model, options: HookOptions) =>
          guardIds([parentOf(row)], options))
      for (const hook of ['beforeBulkUpdate', 'beforeBulkDestroy'] as const)
        child.model.addHook(hook, 'record-guard', async (options: HookOptions) =>
          guardIds(await idsOf(child.model, options, child.foreignKey), options))
    }
  }
}
