import { createHash } from 'node:crypto'
import { Readable } from 'node:stream'
import { ZipArchive, type Archiver, type EntryData } from 'archiver'
import type { H3Event } from 'h3'
import { Op, type WhereOptions } from 'sequelize'
import { ENGINE_VERSION } from '#shared/gas/version'
import type { RecordsArchiveQuery } from '#shared/schemas/records-archive'
import { auditExportLines } from '../database/audit-chain'
import { Aircraft, Operator, Worksheet, type User } from '../models'
import { withTightHeap } from '../utils/heap'
import { logger } from '../utils/logger'
import { exportPeriod } from './audit'
import { worksheetRecordPdf } from './record-export'
import { withinScope, type Scope } from './scope'
import { toWorksheetDto, findWorksheet } from './worksheets'

/**
 * Released records of a period, for an auditor or a retention archive: one ZIP, streamed as it is written,
 * holding each record's PDF (`records/worksheet-<id>.pdf`, which verifies on its own), the records with their
 * signatures as NDJSON (`records.ndjson`), the period's signed audit export (`audit-trail.ndjson`: its unbroken
 * run of the chain, anchored on the entry before it), and `manifest.json` with every
 * file's SHA-256, written last. Records are read in batches by id and each PDF is made only when the archive
 * has taken the one before, so memory stays flat however long the period.
 */

const BATCH = 100

interface ManifestFile {
  path: string
  bytes: number
  sha256: string
}

/** Released worksheets of the period, station and operator (and within the user's scope), by id, in batches. */
async function* releasedIds(query: RecordsArchiveQuery, scope: Scope): AsyncGenerator<number[]> {
  const aircraftWhere: WhereOptions = {}
  if (query.station) Object.assign(aircraftWhere, { base: query.station })
  if (query.operator !== undefined) {
    const named = { [Op.or]: [{ name: query.operator }, { code: query.operator }] }
    const operator = await Operator.findOne({ where: named })
    if (!operator) {
      const issues = [{ path: ['operator'], field: 'operator', message: 'Not a registered operator.' }]
      throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `No operator is named “${query.operator}”.`, data: { issues } })
    }
    // The organisation's own fleet: aircraft that name it, and those from before operators (none named).
    const operatorId = operator.own ? { [Op.or]: [null, operator.id] } : operator.id
    Object.assign(aircraftWhere, { operatorId })
  }
  const aircraft = await Aircraft.findAll({ where: withinScope(scope, aircraftWhere, 'id'), attributes: ['id'] })
  const aircraftIds = aircraft.map(row => row.id)
  const { from, until } = exportPeriod(query)
  let after = 0
  for (;;) {
    const rows = await Worksheet.findAll({
      where: { state: 'released', releasedAt: { [Op.gte]: from, [Op.lt]: until }, aircraftId: aircraftIds, id: { [Op.gt]: after } },
      attributes: ['id'],
      order: [['id', 'ASC']],
      limit: BATCH,
    })
    if (rows.length === 0) return
    yield rows.map(row => row.id)
    after = rows.at(-1)!.id
  }
}

/** Hashes what passes through, for the manifest. */
function hashing(path: string, files: ManifestFile[]) {
  const hash = createHash('sha256')
  let bytes = 0
  return {
    add(chunk: string | Uint8Array) {
      const buffer = typeof chunk === 'string' ? Buffer.from(chunk) : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength)
      hash.update(buffer)
      bytes += buffer.length
      return buffer
    },
    done() {
      files.push({ path, bytes, sha256: hash.digest('hex') })
    },
  }
}

/**
 * Waits until the archive has taken an entry in, so the next is made only then (flat memory), or until the
 * download is closed (`closed` rejects): an entry is never taken once nobody reads the archive.
 */
function appended(
  archive: Archiver,
  closed: Promise<never>,
  source: Buffer | Readable,
  name: string,
  store = false,
): Promise<void> {
  return Promise.race([closed, new Promise<void>((done, fail) => {
    const onEntry = (entry: EntryData) => {
      if (entry.name !== name) return
      archive.off('entry', onEntry)
      archive.off('error', fail)
      done()
    }
    archive.on('entry', onEntry)
    archive.once('error', fail)
    archive.append(source, { name, store })
  })])
}

/** The archive as a stream; the caller sends it. Errors end it without a manifest (so a cut archive shows). */
export function recordsArchive(event: H3Event, actor: User, query: RecordsArchiveQuery, scope: Scope): Readable {
  const archive = new ZipArchive({ zlib: { level: 6 } })
  const files: ManifestFile[] = []
  // A download closed before the end (the browser cancelled it) ends the work, and with it the tight heap.
  const cancelled = new Error('The download was closed before the archive was complete.')
  const closed = new Promise<never>((_, fail) => event.node.res.once('close', () => {
    if (!event.node.res.writableFinished) fail(cancelled)
  }))
  closed.catch(() => undefined)
  const produce = async () => {
    // records.ndjson: streamed as its own entry while it is read, batch by batch. The ids are kept (numbers
    // only), so the PDFs are of exactly these records even if another is released meanwhile.
    const taken: number[] = []
    const ndjson = hashing('records.ndjson', files)
    const lines = async function* () {
      for await (const ids of releasedIds(query, scope)) {
        for (const id of ids) {
          const dto = await toWorksheetDto(await findWorksheet(id))
          taken.push(id)
          yield ndjson.add(`${JSON.stringify(dto)}\n`)
        }
      }
      ndjson.done()
    }
    await appended(archive, closed, Readable.from(lines()), 'records.ndjson')
    // One PDF at a time, each made when the archive has taken the one before.
    for (const id of taken) {
      const path = `records/worksheet-${id}.pdf`
      const pdf = hashing(path, files)
      const bytes = pdf.add(await worksheetRecordPdf(event, id, scope))
      pdf.done()
      await appended(archive, closed, bytes, path, true)
    }
    // The period's signed run of the audit chain; its header (period, anchor) and signature line are kept for
    // the manifest.
    const audit = hashing('audit-trail.ndjson', files)
    let header: { anchor: { entryId: number | null, hash: string } } | undefined
    let trailer = ''
    const auditLines = async function* () {
      for await (const line of auditExportLines(`${actor.name} <${actor.email}>`, exportPeriod(query))) {
        header ??= JSON.parse(line)
        trailer = line
        yield audit.add(line)
      }
      audit.done()
    }
    await appended(archive, closed, Readable.from(auditLines()), 'audit-trail.ndjson')
    const signed = JSON.parse(trailer) as { entries: number, lastHash: string }
    const manifest = {
      format: 'chargewell-records-archive/1',
      createdAt: new Date().toISOString(),
      createdBy: `${actor.name} <${actor.email}>`,
      engineVersion: ENGINE_VERSION,
      period: { from: query.from, to: query.to, days: 'UTC calendar days, both ends included' },
      station: query.station ?? null,
      operator: query.operator ?? null,
      records: taken.length,
      auditTrail: {
        entries: signed.entries,
        anchor: header!.anchor,
        lastHash: signed.lastHash,
        note: 'The period\'s unbroken run of the audit chain, signed with the audit key: its first entry links to the '
          + 'anchor, which is the last entry of the export of the period before. Check it with '
          + '`node scripts/check-audit-export.mjs audit-trail.ndjson --key <fingerprint>`.',
      },
      files,
    }
    await appended(archive, closed, Buffer.from(`${JSON.stringify(manifest, null, 2)}\n`), 'manifest.json')
    await archive.finalize()
  }
  withTightHeap(produce).catch((error) => {
    if (error === cancelled) logger.info({ reqId: event.context.requestId }, 'records archive cancelled by the client')
    else logger.error({ reqId: event.context.requestId, err: error }, 'records archive failed')
    archive.abort()
  })
  return archive
}
