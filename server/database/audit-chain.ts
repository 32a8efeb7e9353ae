import {
  createHash,
  createHmac,
  createPrivateKey,
  createPublicKey,
  hkdfSync,
  sign,
  timingSafeEqual,
  type KeyObject,
} from 'node:crypto'
import { createError } from 'h3'
import { col, fn, Op, QueryTypes, Transaction } from 'sequelize'
import type { ChainReport, RecordProblem } from '../../shared/types/audit'
import { AuditEvent, AuditHead } from '../models'
import { canonical, isRecordKind, recordHash, recordHashes, RECORD_KINDS, type RecordKindName } from './record-hash'
import { guardRecord } from './record-guard'

export const GENESIS_HASH = '0'.repeat(64)
const HEAD_ID = 1

interface AuditFields {
  at: Date
  actorId: number | null
  entity: string
  entityId: string
  action: string
  detail: Record<string, unknown>
}

// ---------------------------------------------------------------------------------------------
// Keys. One server secret (NUXT_AUDIT_SECRET, or derived from the session password) gives two
// keys by HKDF (RFC 5869): an HMAC key for the chain head's seal, and an Ed25519 key that signs
// exports, so an export can be checked offline with the public key alone.

let keys: { seal: Buffer, signing: KeyObject, publicKey: string, fingerprint: string } | null = null

/** The audit secret: NUXT_AUDIT_SECRET when set, else one derived from the session password. */
export function auditSecretFrom(settings: {
  auditSecret?: string | null
  sessionPassword?: string | null
}): string | null {
  if (settings.auditSecret) return settings.auditSecret
  if (settings.sessionPassword) return `session:${settings.sessionPassword}`
  return null
}

/** Sets the secret the chain is sealed and exports are signed with (once, at start-up). */
export function configureAuditSecret(secret: string | null): void {
  if (!secret) {
    keys = null
    return
  }
  const derive = (info: string) => Buffer.from(hkdfSync('sha256', secret, 'chargewell-audit', info, 32))
  // PKCS#8 wrapping of a raw Ed25519 seed (RFC 8410): a fixed 16-byte prefix, then the seed.
  const pkcs8 = Buffer.concat([Buffer.from('302e020100300506032b657004220420', 'hex'), derive('export signing key')])
  const signing = createPrivateKey({ key: pkcs8, format: 'der', type: 'pkcs8' })
  const spki = createPublicKey(signing).export({ type: 'spki', format: 'der' })
  const fingerprint = createHash('sha256').update(spki).digest('hex').slice(0, 32).match(/.{4}/g)!.join(':')
  keys = { seal: derive('chain head seal'), signing, publicKey: spki.toString('base64'), fingerprint }
}

export function auditSigningKey(): { publicKey: string, fingerprint: string } | null {
  return keys ? { publicKey: keys.publicKey, fingerprint: keys.fingerprint } : null
}

interface HeadFields {
  eventCount: number
  lastEventId: number | null
  lastHash: string
}

function sealMatches(head: HeadFields & { seal: string | null }): boolean {
  const expected = Buffer.from(sealOf(head) ?? '', 'hex')
  const stored = Buffer.from(head.seal ?? '', 'hex')
  return expected.length > 0 && expected.length === stored.length && timingSafeEqual(expected, stored)
}

export function sealOf(head: HeadFields): string | null {
  if (!keys) return null
  return createHmac('sha256', keys.seal)
    .update(`chargewell-audit-head:${head.eventCount}:${head.lastEventId ?? ''}:${head.lastHash}`)
    .digest('hex')
}

// ---------------------------------------------------------------------------------------------
// Entries.

/** The hash of one entry: SHA-256 over the previous hash and a canonical form of the entry. */
export function auditHash(
  fields: AuditFields & { recordHash?: string | null },
  previousHash: string,
  version = 2,
): string {
  const canonicalForm
    = version === 1
      ? [
          previousHash,
          fields.at.toISOString(),
          fields.actorId,
          fields.entity,
          fields.entityId,
          fields.action,
          canonical(fields.detail),
        ]
      : [
          2,
          previousHash,
          fields.at.toISOString(),
          fields.actorId,
          fields.entity,
          fields.entityId,
          fields.action,
          canonical(fields.detail),
          fields.recordHash ?? null,
        ]
  return createHash('sha256').update(JSON.stringify(canonicalForm)).digest('hex')
}

/** Writes are stopped: the chain's head is missing or does not match the chain. */
function headRefusal(problem: string): never {
  throw createError({
    status: 503,
    statusMessage: 'Service Unavailable',
    message:
      `The audit trail cannot take new entries: ${problem} Nothing was changed. Writes are stopped until `
      + 'an administrator resolves it (Admin → Audit trail).',
    data: { auditHead: problem },
  })
}

/**
 * The head, locked for this write, checked against the chain's newest entry and its seal. A missing
 * head is created only for a chain that never had sealed-format entries (a database from before
 * the head); otherwise the server refuses to write rather than re-seal a chain it cannot vouch for.
 */
async function lockedHead(transaction: Transaction): Promise<AuditHead> {
  const head = await AuditHead.findByPk(HEAD_ID, { transaction, lock: transaction.LOCK.UPDATE })
  const last = await AuditEvent.findOne({ attributes: ['id', 'hash'], order: [['id', 'DESC']], transaction })
  if (head) {
    if ((head.lastEventId ?? null) !== (last?.id ?? null) || head.lastHash !== (last?.hash ?? GENESIS_HASH))
      headRefusal(`its newest entry (${last?.id ?? 'none'}) is not the one its head was sealed with (${head.lastEventId ?? 'none'}).`)
    if (keys && head.seal && !sealMatches(head))
      headRefusal('the seal of its head does not match: the head or the chain was rebuilt without the server\'s secret.')
    return head
  }
  if (await AuditEvent.count({ where: { hashVersion: 2 }, transaction }))
    headRefusal('its sealed head is missing, so entries deleted or rewritten since cannot be ruled out.')
  // A database created before the head existed: start it from the newest entry.
  return AuditHead.create(
    {
      id: HEAD_ID,
      eventCount: await AuditEvent.count({ transaction }),
      lastEventId: last?.id ?? null,
      lastHash: last?.hash ?? GENESIS_HASH,
      seal: null,
      sealedAt: null,
    },
    { transaction },
  )
}

let requestIdSource: () => string | null = () => null

/** Where an entry learns the id of the request writing it (set by server/plugins/observability.ts). */
export function setRequestIdSource(source: () => string | null): void {
  requestIdSource = source
}

/**
 * Appends one entry to the chain inside the caller's transaction, and moves the sealed head
 * with it. An entry about a record (a worksheet, specification, tool, user, aircraft,
 * accumulator or cycle check) carries the hash of that record's content as it now stands in
 * this transaction, so call it after the record's own writes.
 */
export async function appendAudit(
  fields: Omit<AuditFields, 'at'> & { at?: Date },
  transaction: Transaction,
  options: { trustCurrentContent?: boolean } = {},
): Promise<AuditEvent> {
  const head = await lockedHead(transaction)
  // Millisecond precision and JSON are what the database gives back; hash what will be read back.
  const entry: AuditFields = {
    ...fields,
    at: new Date(Math.floor((fields.at ?? new Date()).getTime())),
    detail: JSON.parse(JSON.stringify(fields.detail ?? {})),
  }
  const recordId = Number(entry.entityId)
  const aboutRecord = isRecordKind(entry.entity) && Number.isInteger(recordId)
  // Vouch only for content the trail already vouched for, changed by this transaction's own writes;
  // a baseline and an administrator's acceptance of a held record are the two deliberate exceptions.
  if (aboutRecord && !options.trustCurrentContent)
    await guardRecord(entry.entity as RecordKindName, recordId, transaction)
  const hashOfRecord = aboutRecord ? await recordHash(entry.entity as RecordKindName, recordId, transaction) : null
  const event = await AuditEvent.create(
    {
      ...entry,
      previousHash: head.lastHash,
      hash: auditHash({ ...entry, recordHash: hashOfRecord }, head.lastHash, 2),
      recordHash: hashOfRecord,
      hashVersion: 2,
      requestId: requestIdSource(),
    },
    { transaction },
  )
  const next = { eventCount: head.eventCount + 1, lastEventId: event.id, lastHash: event.hash }
  await head.update({ ...next, seal: sealOf(next), sealedAt: keys ? new Date() : head.sealedAt }, { transaction })
  return event
}

/**
 * Seals the head over the entries that are there now (an administrator's deliberate act, after
 * finding out why the head did not match; the caller writes the entry that says so).
 */
export async function reanchorHead(transaction: Transaction): Promise<void> {
  const last = await AuditEvent.findOne({ attributes: ['id', 'hash'], order: [['id', 'DESC']], transaction })
  const next = {
    eventCount: await AuditEvent.count({ transaction }),
    lastEventId: last?.id ?? null,
    lastHash: last?.hash ?? GENESIS_HASH,
  }
  const sealed = { ...next, seal: sealOf(next), sealedAt: keys ? new Date() : null }
  const head = await AuditHead.findByPk(HEAD_ID, { transaction, lock: transaction.LOCK.UPDATE })
  if (head) await head.update(sealed, { transaction })
  else await AuditHead.create({ id: HEAD_ID, ...sealed }, { transaction })
}

/**
 * For a database from before record hashes (or a fresh seed): one `integrity-baseline` entry
 * for every record that has none yet, so that from here on each record is vouched for.
 */
export async function baselineRecords(transaction: Transaction): Promise<number> {
  const sequelize = AuditEvent.sequelize!
  const covered = new Set(
    (
      await sequelize.query<{ entity: string, entity_id: string }>(
        'SELECT DISTINCT entity, entity_id FROM audit_events WHERE hash_version = 2 AND record_hash IS NOT NULL',
        { type: QueryTypes.SELECT, transaction },
      )
    ).map(row => `${row.entity}:${row.entity_id}`),
  )
  let added = 0
  for (const kind of Object.keys(RECORD_KINDS) as RecordKindName[]) {
    const rows = (await RECORD_KINDS[kind].model.findAll({
      attributes: ['id'],
      order: [['id', 'ASC']],
      transaction,
      raw: true,
    })) as unknown as { id: number }[]
    for (const { id } of rows) {
      if (covered.has(`${kind}:${id}`)) continue
      await appendAudit(
        { actorId: null, entity: kind, entityId: String(id), action: 'integrity-baseline', detail: {} },
        transaction,
        { trustCurrentContent: true },
      )
      added++
    }
  }
  return added
}

/**
 * At start-up: a chain that has never been sealed (a database from before the seal) gets its
 * records baselined and its head sealed. A chain that holds sealed-format entries but no valid
 * seal is left alone — that is for verification to report, not for the server to paper over.
 */
export async function establishSeal(transaction: Transaction): Promise<{ established: boolean, baselined: number }> {
  if (!keys) return { established: false, baselined: 0 }
  // Read, not checked: a head that does not match is for verification to report and an administrator
  // to resolve; the server still starts (and refuses writes).
  const head = await AuditHead.findByPk(HEAD_ID, { transaction })
  if (head?.seal) return { established: false, baselined: 0 }
  const sealedFormat = await AuditEvent.count({ where: { hashVersion: 2 }, transaction })
  if (sealedFormat > 0) return { established: false, baselined: 0 }
  const baselined = await baselineRecords(transaction)
  await appendAudit(
    {
      actorId: null,
      entity: 'system',
      entityId: 'audit',
      action: 'seal-established',
      detail: { entriesBefore: head?.eventCount ?? 0, recordsBaselined: baselined },
    },
    transaction,
  )
  return { established: true, baselined }
}

// ---------------------------------------------------------------------------------------------
// Verification.

const BATCH = 2000

/**
 * Walks the chain from the start, checks its sealed head, then compares every record with its newest
 * entry — all in one read transaction, so writers working meanwhile are never mistaken for tampering
 * (SQLite: a deferred transaction reads one WAL snapshot; PostgreSQL: REPEATABLE READ).
 */
export async function verifyAuditChain(): Promise<ChainReport> {
  const sequelize = AuditEvent.sequelize!
  const snapshot
    = sequelize.getDialect() === 'postgres'
      ? { isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ, readOnly: true }
      : { type: Transaction.TYPES.DEFERRED }
  return sequelize.transaction(snapshot, () => verifyInSnapshot())
}

async function verifyInSnapshot(): Promise<ChainReport> {
  let previousHash = GENESIS_HASH
  let checked = 0
  let lastId = 0
  let firstBroken: ChainReport['firstBroken']
  const vouched = new Map<string, { recordHash: string, eventId: number }>()
  for (;;) {
    const batch = await AuditEvent.findAll({ where: { id: { [Op.gt]: lastId } }, order: [['id', 'ASC']], limit: BATCH })
    if (batch.length === 0) break
    for (const event of batch) {
      if (!firstBroken) {
        if (event.previousHash !== previousHash)
          firstBroken = { id: event.id, reason: `does not link to entry ${lastId || 'at the start of the chain'}` }
        else if (auditHash(event, previousHash, event.hashVersion) !== event.hash)
          firstBroken = { id: event.id, reason: 'its content does not match its hash' }
      }
      if (event.hashVersion === 2 && event.recordHash)
        vouched.set(`${event.entity}:${event.entityId}`, { recordHash: event.recordHash, eventId: event.id })
      previousHash = event.hash
      lastId = event.id
      checked++
    }
  }

  const head = await AuditHead.findByPk(HEAD_ID)
  const headProblems: string[] = []
  if (!head) headProblems.push('The chain has no head record: it cannot be checked for missing entries.')
  else {
    if (head.eventCount !== checked)
      headProblems.push(
        `The sealed head counts ${head.eventCount} entries but ${checked} are present: entries were ${head.eventCount > checked ? 'deleted' : 'added outside Chargewell'}.`,
      )
    if ((head.lastEventId ?? 0) !== lastId || head.lastHash !== previousHash)
      headProblems.push(
        `The newest entry (${lastId || 'none'}) is not the one the head was sealed with (${head.lastEventId ?? 'none'}).`,
      )
    if (!head.seal) headProblems.push('The chain head is not sealed.')
    else if (keys) {
      if (!sealMatches(head))
        headProblems.push(
          'The chain head\'s seal does not match: the head or the chain was rebuilt without the server\'s secret.',
        )
    }
  }

  const records: RecordProblem[] = []
  let mismatches = 0
  let recordsChecked = 0
  const report = (problem: RecordProblem) => {
    mismatches++
    if (records.length < 50) records.push(problem)
  }
  for (const kind of Object.keys(RECORD_KINDS) as RecordKindName[]) {
    let afterId = 0
    for (;;) {
      const ids = (
        (await RECORD_KINDS[kind].model.findAll({
          attributes: ['id'],
          where: { id: { [Op.gt]: afterId } },
          order: [['id', 'ASC']],
          limit: 500,
          raw: true,
        })) as unknown as { id: number }[]
      ).map(row => row.id)
      if (ids.length === 0) break
      const hashes = await recordHashes(kind, ids)
      for (const id of ids) {
        recordsChecked++
        const entry = vouched.get(`${kind}:${id}`)
        vouched.delete(`${kind}:${id}`)
        if (!entry)
          report({
            entity: kind,
            entityId: String(id),
            reason: `${kind} ${id} has no audit entry vouching for its content: it was written outside Chargewell.`,
          })
        else if (entry.recordHash !== hashes.get(id))
          report({
            entity: kind,
            entityId: String(id),
            reason: `${kind} ${id} no longer matches its audit entry ${entry.eventId}: it was changed outside Chargewell.`,
          })
      }
      afterId = ids.at(-1)!
    }
  }
  for (const [key, entry] of vouched) {
    const [entity, entityId] = key.split(':') as [string, string]
    if (isRecordKind(entity))
      report({
        entity,
        entityId,
        reason: `${entity} ${entityId} is missing: audit entry ${entry.eventId} vouches for it, but the row was deleted.`,
      })
  }

  const ok = !firstBroken && headProblems.length === 0 && mismatches === 0
  return {
    ok,
    checked,
    recordsChecked,
    head: { eventCount: head?.eventCount ?? null, sealed: !!head?.seal, sealChecked: !!keys && !!head?.seal },
    ...(firstBroken ? { firstBroken } : {}),
    headProblems,
    ...(records[0] ? { firstMismatch: records[0] } : {}),
    mismatches,
    records,
  }
}

// ---------------------------------------------------------------------------------------------
// Signed export: newline-delimited JSON (a header line, one line per entry, a signature line),
// read in batches so its size does not matter. scripts/check-audit-export.mjs checks it offline.

export const EXPORT_FORMAT = 'chargewell-audit-export'

/** A period of the chain to export: entries written from `from` until (not including) `until`. */
export interface ExportPeriod {
  from: Date
  until: Date
  /** The period as asked, e.g. { from: '2026-01-01', to: '2026-12-31' } (UTC days, both included). */
  label: { from: string, to: string }
}

/**
 * The entries of a period as one unbroken run of the chain: from the lowest id written in the period to the
 * highest, every entry between them included, so the run links from end to end. (The chain's order is its
 * ids; an entry between them dated outside the period — one written with an earlier date by an import, or
 * after a clock correction — is kept and counted as outside it by the checker.) The anchor is the entry
 * before the run: its hash is what the run's first entry links to.
 */
interface ChainRun {
  firstId: number
  lastId: number
  anchorId: number | null
  anchorHash: string
}

async function periodRun(period: ExportPeriod): Promise<ChainRun> {
  // An index-only read of the period's range of (at, id) (migration 0018).
  const ends = await AuditEvent.findOne({
    where: { at: { [Op.gte]: period.from, [Op.lt]: period.until } },
    attributes: [[fn('MIN', col('id')), 'first'], [fn('MAX', col('id')), 'last']],
    raw: true,
  }) as unknown as { first: number | null, last: number | null } | null
  if (ends?.first && ends.last) {
    const anchor = await AuditEvent.findOne({
      where: { id: { [Op.lt]: ends.first } },
      order: [['id', 'DESC']],
      attributes: ['id', 'hash'],
    })
    const anchorHash = anchor?.hash ?? GENESIS_HASH
    return { firstId: ends.first, lastId: ends.last, anchorId: anchor?.id ?? null, anchorHash }
  }
  // No entry in the period: an empty run, anchored on the newest entry written before it.
  const before = await AuditEvent.findOne({
    where: { at: { [Op.lt]: period.from } },
    order: [['at', 'DESC'], ['id', 'DESC']],
    attributes: ['id', 'hash'],
  })
  return { firstId: 1, lastId: 0, anchorId: before?.id ?? null, anchorHash: before?.hash ?? GENESIS_HASH }
}

/**
 * The chain as signed lines: a header, one line per entry, and a signature line over the digest of every
 * line before it, the entry count, the last hash and the sealed head (Ed25519, the audit key). With a
 * period, version 3: the period's run of the chain (`periodRun`), its header naming the period and the
 * anchor (the entry before the run and its hash), which the signature covers with the rest.
 */
export async function* auditExportLines(exportedBy: string, period?: ExportPeriod): AsyncGenerator<string> {
  if (!keys) throw new Error('No audit secret is configured: the export cannot be signed.')
  const digest = createHash('sha256')
  const emit = (value: unknown) => {
    const line = `${JSON.stringify(value)}\n`
    digest.update(line)
    return line
  }
  const whole: ChainRun = { firstId: 1, lastId: Number.MAX_SAFE_INTEGER, anchorId: null, anchorHash: GENESIS_HASH }
  const run = period ? await periodRun(period) : whole
  const version = period ? 3 : 2
  yield emit({
    format: EXPORT_FORMAT,
    version,
    exportedAt: new Date().toISOString(),
    exportedBy,
    publicKey: keys.publicKey,
    keyFingerprint: keys.fingerprint,
    ...(period
      ? {
          period: {
            from: period.label.from,
            to: period.label.to,
            fromInstant: period.from.toISOString(),
            untilInstant: period.until.toISOString(),
          },
          anchor: { entryId: run.anchorId, hash: run.anchorHash },
        }
      : {}),
  })
  let lastId = run.firstId - 1
  let count = 0
  let lastHash = run.anchorHash
  for (;;) {
    const batch = await AuditEvent.findAll({
      where: { id: { [Op.gt]: lastId, [Op.lte]: run.lastId } },
      order: [['id', 'ASC']],
      limit: BATCH,
    })
    if (batch.length === 0) break
    let lines = ''
    for (const event of batch) {
      lines += emit({
        id: event.id,
        at: event.at.toISOString(),
        actorId: event.actorId,
        entity: event.entity,
        entityId: event.entityId,
        action: event.action,
        detail: event.detail,
        recordHash: event.recordHash,
        hashVersion: event.hashVersion,
        previousHash: event.previousHash,
        hash: event.hash,
      })
      lastId = event.id
      lastHash = event.hash
      count++
    }
    yield lines
  }
  const head = await AuditHead.findByPk(HEAD_ID)
  const hex = digest.digest('hex')
  const sealedHead = head
    ? { eventCount: head.eventCount, lastEventId: head.lastEventId, lastHash: head.lastHash }
    : null
  // Version 2 signs the sealed head with the rest (version 1 left it outside the signature); version 3 is
  // signed as version 2 is, its header (in the digest) carrying the period and the anchor.
  const signed = `${EXPORT_FORMAT}:${version}:${hex}:${count}:${lastHash}:${JSON.stringify(canonical(sealedHead))}`
  const message = Buffer.from(signed)
  yield `${JSON.stringify({
    entries: count,
    lastHash,
    sealedHead,
    digest: hex,
    signature: sign(null, message, keys.signing).toString('base64'),
  })}\n`
}
