/**
 * A database that looks like a fleet for the scale benchmark (see buildScaleDatabase): every row
 * with its signatures and an audit entry vouching for its content, chained and sealed like the
 * server's. Bulk inserts, not the app's routes.
 */
import { execFileSync } from 'node:child_process'
import type { Database as SqliteDatabase } from 'sqlite3'
import { DataTypes, Op, QueryTypes, type Model, type ModelStatic, type Sequelize, type Transaction } from 'sequelize'
import type { WorksheetContent } from '../../shared/types/worksheet'
import { appendAudit, auditHash, configureAuditSecret, sealOf } from '../../server/database/audit-chain'
import { isPostgresUrl, openDatabase } from '../../server/database/connection'
import { hashOfRow, recordHashes, type RecordKindName } from '../../server/database/record-hash'
import { sqliteDateText } from '../../server/utils/stored-date'
import { rebuildTrends } from '../../server/services/unit-trends'
import { fillSearchPrefixes } from '../../server/migrations/0019-search-prefixes'
import { createWriteQueue } from '../../server/database/write-queue'
import {
  Accumulator, AccumulatorInstallation, Aircraft, AuditEvent, AuditHead, CycleCheck, listColumns, Signature,
  SystemCycleTrend, Worksheet,
} from '../../server/models'

const DAY = 86_400_000
const BATCH = 1000

const ISO_TIME = /"(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(?:\.\d+)?Z)"/g
const textOf = new WeakMap<object, string>()

/** Moves every ISO time stamp inside a worksheet's content by `offset` ms (on its JSON text, kept per template). */
function shifted(content: object, offset: number): unknown {
  let text = textOf.get(content)
  if (text === undefined) textOf.set(content, text = JSON.stringify(content))
  if (offset === 0) return JSON.parse(text)
  return JSON.parse(text.replace(ISO_TIME, (_match, time: string) => `"${new Date(Date.parse(time) + offset).toISOString()}"`))
}

type Row = Record<string, unknown>
/** Kinds whose in-memory hashes were checked once against the same rows read back. */
const checkedKinds = new Set<RecordKindName>()

/**
 * Rows the trail vouches for, appended in one go: their record hashes chained from the current head and
 * sealed. The hashes come from the rows as written (`hashOfRow`); the first batch of each kind is also
 * read back and hashed as the server does, and the build stops if the two disagree.
 */
async function vouch(
  kind: RecordKindName,
  rows: { row: Row, children?: Record<string, Row[]>, at: Date }[],
  action: string,
  transaction: Transaction,
): Promise<void> {
  if (!rows.length) return
  const hashes = new Map(rows.map(({ row, children }) => [row.id as number, hashOfRow(kind, row, children)]))
  if (!checkedKinds.has(kind)) {
    const read = await recordHashes(kind, [...hashes.keys()], transaction)
    for (const [id, hash] of hashes) {
      if (read.get(id) !== hash)
        throw new Error(`The builder's hash of ${kind} ${id} is not the one the server computes from the row it reads.`)
    }
    checkedKinds.add(kind)
  }
  const head = (await AuditHead.findByPk(1, { transaction }))!
  let previous = head.lastHash
  const events = rows.map(({ row, at }) => {
    const entry = {
      at,
      actorId: null,
      entity: kind,
      entityId: String(row.id),
      action,
      detail: { history: true },
      recordHash: hashes.get(row.id as number)!,
    }
    const hash = auditHash(entry, previous, 2)
    const event = { ...entry, previousHash: previous, hash, hashVersion: 2 }
    previous = hash
    return event
  })
  let nextEventId = ((await AuditEvent.max<number, AuditEvent>('id', { transaction })) ?? 0) + 1
  const numbered = events.map(event => ({ ...event, id: nextEventId++ }))
  await insertRows(AuditEvent, numbered, transaction)
  const lastEventId = numbered.at(-1)!.id
  const next = { eventCount: head.eventCount + events.length, lastEventId, lastHash: previous }
  await head.update({ ...next, seal: sealOf(next), sealedAt: new Date() }, { transaction })
}

/** A value as Sequelize writes it into SQLite for the column's type. */
function sqliteValue(value: unknown, type: unknown): unknown {
  if (value === null || value === undefined) return null
  if (value instanceof Date) {
    // DATEONLY columns hold the day; DATE columns the UTC instant as 'YYYY-MM-DD HH:MM:SS.SSS +00:00'.
    return type instanceof DataTypes.DATEONLY
      ? value.toISOString().slice(0, 10)
      : sqliteDateText(value)
  }
  if (type instanceof DataTypes.JSON) return JSON.stringify(value)
  if (typeof value === 'boolean') return value ? 1 : 0
  return value
}

/**
 * Rows written as they are, with their ids, without a model instance per row (building them was most of
 * the builder's own time). On SQLite one prepared INSERT per batch, run row by row in the write's
 * transaction: a multi-row INSERT of a thousand worksheets is megabytes of SQL that Sequelize lower-cases
 * and SQLite parses whole. On PostgreSQL Sequelize's multi-row INSERT. Values are written by the models'
 * column types as Sequelize writes them; the first batch of each kind is read back and hashed (vouch), so a
 * difference stops the build.
 */
async function insertRows(model: ModelStatic<Model>, rows: Record<string, unknown>[], transaction: Transaction) {
  if (!rows.length) return
  const attributes = model.getAttributes() as Record<string, { field?: string, type: unknown }>
  const names = Object.keys(attributes).filter(name => !(attributes[name]!.type instanceof DataTypes.VIRTUAL))
  const fieldOf = (name: string) => attributes[name]!.field ?? name
  const sequelize = model.sequelize!
  if (sequelize.getDialect() !== 'sqlite') {
    const records = rows.map(row => Object.fromEntries(names.map(name => [fieldOf(name), row[name] ?? null])))
    const types = Object.fromEntries(names.map(name => [fieldOf(name), attributes[name]]))
    await sequelize.getQueryInterface().bulkInsert(model.getTableName(), records, { transaction }, types as never)
    return
  }
  const database = (transaction as unknown as { connection: SqliteDatabase }).connection
  const statement = database.prepare(
    `INSERT INTO \`${model.getTableName() as string}\` (${names.map(name => `\`${fieldOf(name)}\``).join(', ')}) `
    + `VALUES (${names.map(() => '?').join(', ')})`,
  )
  try {
    await Promise.all(rows.map(row => new Promise<void>((done, fail) => statement.run(
      names.map(name => sqliteValue(row[name], attributes[name]!.type)),
      (error: Error | null) => (error ? fail(error) : done()),
    ))))
  }
  finally {
    await new Promise<void>(done => statement.finalize(() => done()))
  }
}

/** At most this much history: a fleet's records for ten years, never a worksheet dated in another century. */
const HISTORY_YEARS = 10

/** The tables the builder loads in bulk. */
const BULK_TABLES = ['worksheets', 'signatures', 'audit_events', 'cycle_checks', 'accumulators', 'accumulator_installations']

/**
 * Drops the secondary indexes of `tables` and returns the statements that create them again: on SQLite
 * from sqlite_master (indexes a table's own UNIQUE or PRIMARY KEY clause creates have no statement and
 * stay), on PostgreSQL from pg_indexes (indexes that back a constraint stay).
 */
async function dropSecondaryIndexes(sequelize: Sequelize, tables: string[]): Promise<string[]> {
  const postgres = sequelize.getDialect() === 'postgres'
  const rows = await sequelize.query<{ name: string, definition: string }>(
    postgres
      ? `SELECT i.indexname AS name, i.indexdef AS definition FROM pg_indexes i
         WHERE i.schemaname = current_schema() AND i.tablename IN (:tables)
           AND NOT EXISTS (SELECT 1 FROM pg_constraint c WHERE c.conindid = (quote_ident(i.schemaname) || '.' || quote_ident(i.indexname))::regclass)`
      : `SELECT name, sql AS definition FROM sqlite_master WHERE type = 'index' AND tbl_name IN (:tables) AND sql IS NOT NULL`,
    { replacements: { tables }, type: QueryTypes.SELECT },
  )
  for (const row of rows) await sequelize.query(`DROP INDEX ${postgres ? `"${row.name}"` : `\`${row.name}\``}`)
  return rows.map(row => row.definition)
}

/**
 * SQLite: drops the worksheets' search-prefix triggers (migration 0019) for the load and returns their
 * statements: the table is filled once from the loaded rows after (row by row they were ~30 upserts a worksheet).
 */
async function dropSearchPrefixTriggers(sequelize: Sequelize): Promise<string[]> {
  if (sequelize.getDialect() === 'postgres') return []
  const rows = await sequelize.query<{ name: string, definition: string }>(
    `SELECT name, sql AS definition FROM sqlite_master WHERE type = 'trigger' AND tbl_name = 'worksheets'`,
    { type: QueryTypes.SELECT },
  )
  for (const row of rows) await sequelize.query(`DROP TRIGGER \`${row.name}\``)
  return rows.map(row => row.definition)
}

/**
 * A database that looks like a fleet of `count` worksheets: the demo fleet (6 aircraft, 21 units, a
 * year of released work, monthly pump-cycle checks, some open work) copied whole — aircraft, units,
 * installations, open work — as many times as `count` needs with at most ten years of history per
 * copy, each year of released work and cycle checks repeated back in time on its own copy's units.
 * At 100,000 worksheets that is about 480 aircraft, 1,700 units and 80,000 cycle checks. Bulk inserts
 * in one transaction per thousand rows, each row vouched for by the audit trail.
 */
export async function buildScaleDatabase(
  location: string,
  count: number,
  secret: string,
  log = (line: string) => console.log(line),
): Promise<void> {
  // The demo scenario first, seeded by the built server's own task (scripts/task.mjs).
  const postgres = isPostgresUrl(location)
  execFileSync(process.execPath, ['scripts/task.mjs', 'db:seed'], {
    stdio: 'inherit',
    env: {
      ...process.env,
      NUXT_DB_PATH: postgres ? '' : location,
      NUXT_DATABASE_URL: postgres ? location : '',
      NUXT_SESSION_PASSWORD: secret,
      NUXT_AUDIT_SECRET: '',
    },
  })
  configureAuditSecret(`session:${secret}`)
  const sequelize: Sequelize = await openDatabase(location)
  const write = createWriteQueue(sequelize)
  // A database built for a benchmark is built again if the machine stops: no waiting for the disk at each
  // commit (SQLite opens a connection per transaction, so it is said on each).
  if (!postgres) {
    sequelize.addHook('afterConnect', connection => new Promise<void>((done, fail) =>
      (connection as SqliteDatabase).run('PRAGMA synchronous = OFF', error => (error ? fail(error) : done()))))
  }
  try {
    const templates = await Worksheet.findAll({
      where: { state: 'released' },
      order: [['performedAt', 'ASC']],
      include: [{ model: Signature, as: 'signatures' }],
    })
    const openWork = await Worksheet.findAll({ where: { state: { [Op.ne]: 'released' }, voidedById: null } })
    const checks = await CycleCheck.findAll({ where: { withdrawnAt: null } })
    const fleet = await Aircraft.findAll({ order: [['id', 'ASC']] })
    const units = await Accumulator.findAll({ where: { aircraftId: { [Op.ne]: null } }, order: [['id', 'ASC']] })
    const installations = await AccumulatorInstallation.findAll({
      where: { accumulatorId: units.map(unit => unit.id) },
    })
    const span = templates.at(-1)!.performedAt!.getTime() - templates[0]!.performedAt!.getTime() + 60 * DAY
    const years = Math.max(1, Math.floor((HISTORY_YEARS * 365 * DAY) / span))
    const existing = await Worksheet.count()
    const toAdd = Math.max(0, count - existing)
    const copies = Math.max(1, Math.ceil((toAdd + templates.length) / (templates.length * years)))
    log(`  ${copies} copies of the fleet (${copies * fleet.length} aircraft, ${copies * units.length} units), up to ${years} spans of history each`)

    // Secondary indexes are dropped while the rows go in and built again after, from their own definitions:
    // building an index from a full table sorts once, where keeping twenty indexes up to date row by row
    // was most of the build's database time. Unique indexes are rebuilt too, so a duplicate still fails.
    const indexes = await dropSecondaryIndexes(sequelize, BULK_TABLES)
    const triggers = await dropSearchPrefixTriggers(sequelize)
    log(`  ${indexes.length} indexes and ${triggers.length} triggers set aside while loading`)

    // The fleet copies: copy c's aircraft and units, by the originals' ids.
    const aircraftOf: Map<number, Aircraft>[] = [new Map(fleet.map(row => [row.id, row]))]
    const unitOf: Map<number, Accumulator>[] = [new Map(units.map(row => [row.id, row]))]
    let nextAircraftId = (await Aircraft.max<number, Aircraft>('id'))! + 1
    let nextUnitId = (await Accumulator.max<number, Accumulator>('id'))! + 1
    let nextInstallationId = ((await AccumulatorInstallation.max<number, AccumulatorInstallation>('id')) ?? 0) + 1
    for (let first = 1; first < copies; first += 50) {
      const last = Math.min(copies, first + 50)
      const aircraftRows: Record<string, unknown>[] = []
      const unitRows: Record<string, unknown>[] = []
      const installationRows: Record<string, unknown>[] = []
      for (let copy = first; copy < last; copy++) {
        const aircraftMap = new Map<number, Aircraft>()
        for (const row of fleet) {
          const plain = { ...row.get({ plain: true }), id: nextAircraftId++, registration: `${row.registration}-${copy}`, fleetNumber: `${row.fleetNumber}-${copy}` }
          aircraftRows.push(plain)
          aircraftMap.set(row.id, plain as unknown as Aircraft)
        }
        const unitMap = new Map<number, Accumulator>()
        for (const row of units) {
          const plain = { ...row.get({ plain: true }), id: nextUnitId++, aircraftId: aircraftMap.get(row.aircraftId!)!.id, serialNumber: `${row.serialNumber}-${copy}` }
          unitRows.push(plain)
          unitMap.set(row.id, plain as unknown as Accumulator)
        }
        for (const row of installations) {
          installationRows.push({
            ...row.get({ plain: true }),
            id: nextInstallationId++,
            accumulatorId: unitMap.get(row.accumulatorId)!.id,
            aircraftId: aircraftMap.get(row.aircraftId)?.id ?? row.aircraftId,
          })
        }
        aircraftOf.push(aircraftMap)
        unitOf.push(unitMap)
      }
      await write(async (transaction) => {
        await Aircraft.bulkCreate(aircraftRows as never[], { transaction })
        await Accumulator.bulkCreate(unitRows as never[], { transaction })
        await AccumulatorInstallation.bulkCreate(installationRows as never[], { transaction })
        const at = new Date()
        await vouch('aircraft', aircraftRows.map(row => ({ row, at })), 'created', transaction)
        const installationsOf = (id: unknown) => installationRows.filter(row => row.accumulatorId === id)
        await vouch('accumulator', unitRows.map(row => ({ row, at, children: { installations: installationsOf(row.id) } })), 'created', transaction)
      })
    }

    /** A worksheet's content moved to another copy of the fleet. */
    const onCopy = (content: WorksheetContent, copy: number): WorksheetContent => {
      if (copy === 0) return content
      const aircraft = aircraftOf[copy]!.get(content.aircraft.id)
      const unit = unitOf[copy]!.get(content.accumulator.id)
      if (!aircraft || !unit) return content
      return {
        ...content,
        aircraft: {
          ...content.aircraft, id: aircraft.id, registration: aircraft.registration, fleetNumber: aircraft.fleetNumber,
        },
        accumulator: { ...content.accumulator, id: unit.id, serialNumber: unit.serialNumber },
      }
    }
    let nextId = (await Worksheet.max<number, Worksheet>('id'))! + 1
    let nextSignatureId = (await Signature.max<number, Signature>('id'))! + 1
    const copyWorksheet = (template: Worksheet, copy: number, offset: number, workOrder: string) => {
      const id = nextId++
      const at = (date: Date | null) => (date ? new Date(date.getTime() + offset) : null)
      const content = onCopy(shifted(template.content as object, offset) as WorksheetContent, copy)
      return {
        ...template.get({ plain: true }),
        ...listColumns(content, template.results ?? {}),
        id,
        signatures: undefined,
        aircraftId: content.aircraft.id,
        accumulatorId: content.accumulator.id,
        workOrder,
        content,
        performedAt: at(template.performedAt),
        submittedAt: at(template.submittedAt),
        releasedAt: at(template.releasedAt),
        createdAt: at(template.createdAt),
        updatedAt: at(template.updatedAt),
        clientId: null,
        version: 1,
      }
    }

    // Open work on every copy, as each copy's station would have it.
    for (let first = 1; first < copies; first += 100) {
      const rows: Record<string, unknown>[] = []
      for (let copy = first; copy < Math.min(copies, first + 100); copy++)
        for (const [index, template] of openWork.entries()) rows.push(copyWorksheet(template, copy, 0, `WO-O-${copy}-${index}`))
      await write(async (transaction) => {
        await insertRows(Worksheet, rows, transaction)
        await vouch('worksheet', rows.map(row => ({ row, at: row.createdAt as Date })), 'started', transaction)
      })
    }

    const started = Date.now()
    for (let done = 0; done < toAdd; done += BATCH) {
      const size = Math.min(BATCH, toAdd - done)
      const worksheets: Record<string, unknown>[] = []
      const signatures: Record<string, unknown>[] = []
      const signaturesOf = new Map<number, Record<string, unknown>[]>()
      for (let index = 0; index < size; index++) {
        // Block 0 (copy 0, the latest span) is the seeded year; then every copy's latest span, then the span before …
        const slot = done + index + templates.length
        const template = templates[slot % templates.length]!
        const block = Math.floor(slot / templates.length)
        const copy = block % copies
        const offset = -Math.floor(block / copies) * span
        const row = copyWorksheet(template, copy, offset, `WO-H-${String(done + index).padStart(7, '0')}`)
        worksheets.push(row)
        const own = (template.signatures ?? []).map(signature => ({
          ...signature.get({ plain: true }),
          id: nextSignatureId++,
          worksheetId: row.id,
          signedAt: new Date(signature.signedAt.getTime() + offset),
        }))
        signatures.push(...own)
        signaturesOf.set(row.id, own)
      }
      await write(async (transaction) => {
        await insertRows(Worksheet, worksheets, transaction)
        await insertRows(Signature, signatures, transaction)
        await vouch('worksheet', worksheets.map(row => ({
          row, at: row.releasedAt as Date, children: { signatures: signaturesOf.get(row.id as number) ?? [] },
        })), 'released', transaction)
      })
      if ((done / BATCH) % 20 === 0)
        log(`  ${existing + done + size} worksheets (${((Date.now() - started) / 1000).toFixed(0)} s)`)
    }

    // A year of monthly pump-cycle checks per system, on every copy, for each span of history the copy has.
    const spansUsed = Math.ceil((toAdd + templates.length) / (templates.length * copies))
    let nextCheckId = (await CycleCheck.max<number, CycleCheck>('id'))! + 1
    let pending: Record<string, unknown>[] = []
    const flush = async () => {
      const rows = pending
      pending = []
      await write(async (transaction) => {
        await insertRows(CycleCheck, rows, transaction)
        await vouch('cycle-check', rows.map(row => ({ row, at: row.createdAt as Date })), 'recorded', transaction)
      })
    }
    let checkCount = 0
    for (let copy = 0; copy < copies; copy++) {
      for (let back = 0; back < spansUsed; back++) {
        if (copy === 0 && back === 0) continue
        const offset = -back * span
        for (const check of checks) {
          const aircraft = aircraftOf[copy]!.get(check.aircraftId)!
          const unit = unitOf[copy]!.get(check.accumulatorId)!
          const checkedAt = new Date(check.checkedAt.getTime() + offset)
          pending.push({
            ...check.get({ plain: true }),
            id: nextCheckId++,
            aircraftId: aircraft.id,
            accumulatorId: unit.id,
            checkedAt,
            inputs: { ...check.inputs, aircraftId: aircraft.id, checkedAt: checkedAt.toISOString().slice(0, 10) },
            createdAt: checkedAt,
            updatedAt: null,
          })
          checkCount++
          if (pending.length >= BATCH) await flush()
        }
      }
    }
    if (pending.length) await flush()
    log(`  ${checkCount + checks.length} pump-cycle checks`)
    const indexing = Date.now()
    for (const definition of indexes) await sequelize.query(definition)
    if (triggers.length) {
      await fillSearchPrefixes(sequelize.getQueryInterface())
      for (const definition of triggers) await sequelize.query(definition)
    }
    log(`  ${indexes.length} indexes built${triggers.length ? ' and the search prefixes filled' : ''} in ${((Date.now() - indexing) / 1000).toFixed(1)} s`)
    // Rows went in with their ids: PostgreSQL's id sequences are moved past them, or the server's next row would clash.
    if (postgres) {
      for (const table of BULK_TABLES)
        await sequelize.query(`SELECT setval(pg_get_serial_sequence('${table}', 'id'), (SELECT max(id) FROM ${table}))`)
    }
    await write(transaction =>
      appendAudit(
        { actorId: null, entity: 'system', entityId: 'bench', action: 'history-added', detail: { worksheets: toAdd, copies } },
        transaction,
      ),
    )
    log('Deriving the stored pre-charge trends…')
    await rebuildTrends(write, log)
    // The pump-cycle trends are derived by the server when it starts on this database (server/utils/db.ts).
    await SystemCycleTrend.destroy({ where: {} })
    if (!postgres) await sequelize.query('PRAGMA wal_checkpoint(TRUNCATE)')
    // PostgreSQL: as autovacuum would leave a table loaded in bulk (visibility map set, statistics fresh).
    // SQLite: statistics from a sample of each index, as `PRAGMA optimize` gathers them (a full ANALYZE
    // read every index whole: a fifth of the build).
    if (!postgres) await sequelize.query('PRAGMA analysis_limit = 1000')
    await sequelize.query(postgres ? 'VACUUM ANALYZE' : 'ANALYZE')
  }
  finally {
    await sequelize.close()
  }
}
