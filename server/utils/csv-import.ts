import type { H3Event } from 'h3'
import Papa from 'papaparse'
import { UniqueConstraintError, type Model, type ModelStatic, type Transaction, type WhereOptions } from 'sequelize'
import type { ZodType, ZodTypeDef } from 'zod'
import { toFieldIssues } from '#shared/schemas/issues'
import { appendAudit } from '../database/audit-chain'
import type { RecordKindName } from '../database/record-hash'

export interface RejectedRow {
  /** The line in the file (the header is line 1). */
  line: number
  field: string
  message: string
}

/** What one row of an import does: adds a record, changes some of its fields (from → to), or nothing. */
export interface RowChange {
  line: number
  /** The row's natural key, in words ("GA-0141", "FA-2210-03 SN1001"). */
  key: string
  action: 'added' | 'updated' | 'unchanged'
  changes?: Record<string, { from: unknown, to: unknown }>
}

export interface ImportReport {
  /** Rows written (added or updated); none in a preview. */
  imported: number
  added: number
  updated: number
  unchanged: number
  /** True when nothing was written: the changes are what an import of the same file would make. */
  preview: boolean
  changes: RowChange[]
  rejected: RejectedRow[]
}

/** Thrown inside a preview's transaction so that everything it did is rolled back. */
class PreviewDone extends Error {}

/** A cell's value as the comparison sees it: empty, null and undefined alike; numbers by value. */
function comparable(value: unknown): string {
  if (value === null || value === undefined || value === '') return ''
  if (value instanceof Date) return value.toISOString()
  if (typeof value === 'number') return String(Number(value))
  return String(value)
}

/**
 * The fields of `next` that differ from the record's, as from → to (only the fields `next` names).
 */
export function changedFields(
  record: Model,
  next: Record<string, unknown>,
): Record<string, { from: unknown, to: unknown }> {
  const out: Record<string, { from: unknown, to: unknown }> = {}
  for (const [field, value] of Object.entries(next)) {
    if (value === undefined) continue
    const from = record.get(field)
    if (comparable(from) !== comparable(value)) out[field] = { from: from ?? null, to: value ?? null }
  }
  return out
}

const MAX_ROWS = 5000

/** The CSV text of a request: a text/csv body, or the "file" part of a multipart form. */
export async function readCsvText(event: H3Event): Promise<string> {
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (type.startsWith('multipart/form-data')) {
    const file = (await readMultipartFormData(event))?.find(part => part.name === 'file')
    if (!file)
      throw createError({
        status: 400,
        statusMessage: 'Bad Request',
        message: 'Attach the CSV file in the field "file".',
      })
    return file.data.toString('utf8')
  }
  const text = await readRawBody(event, 'utf8')
  if (!text?.trim())
    throw createError({
      status: 400,
      statusMessage: 'Bad Request',
      message: 'Send the CSV as the request body (text/csv) or as a file upload.',
    })
  return text
}

/**
 * Checks every row of a CSV against the shared row schema, then writes all of them in one
 * transaction — or none: with any row rejected (or refused by the database) the answer is 422
 * with a line-by-line report, and nothing is imported. Each row adds a record or updates the one
 * with its natural key (`write` says which, and what changed), so an exported register edited in a
 * spreadsheet imports back as exactly its edits. With `?preview=true` the same writes run and are
 * rolled back: the answer lists every change and every problem, and nothing is kept.
 */
export async function importCsv<Row>(
  event: H3Event,
  schema: ZodType<Row, ZodTypeDef, unknown>,
  write: (row: Row, transaction: Transaction, line: number) => Promise<Omit<RowChange, 'line'>>,
  check?: (row: Row, line: number) => Promise<RejectedRow[]>,
): Promise<ImportReport> {
  const preview = getQuery(event).preview === 'true'
  const parsed = Papa.parse<Record<string, string>>((await readCsvText(event)).replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: header => header.trim(),
    transform: unguardCell,
  })
  if (parsed.data.length > MAX_ROWS)
    throw createError({
      status: 413,
      statusMessage: 'Payload Too Large',
      message: `At most ${MAX_ROWS} rows per import.`,
    })
  const rejected: RejectedRow[] = parsed.errors.map(error => ({
    line: (error.row ?? 0) + 2,
    field: '(row)',
    message: error.message,
  }))
  const rows: { row: Row, line: number }[] = []
  for (const [index, raw] of parsed.data.entries()) {
    const line = index + 2
    const result = schema.safeParse(raw)
    if (!result.success) {
      rejected.push(
        ...toFieldIssues(result.error.issues).map(issue => ({ line, field: issue.field, message: issue.message })),
      )
      continue
    }
    const problems = check ? await check(result.data, line) : []
    if (problems.length) rejected.push(...problems)
    else rows.push({ row: result.data, line })
  }
  if (parsed.data.length === 0)
    rejected.push({ line: 1, field: '(file)', message: 'The file has a header but no rows.' })
  const changes: RowChange[] = []
  if (rejected.length === 0) {
    let current = 0
    try {
      await writeTransaction(async (transaction) => {
        for (const { row, line } of rows) {
          current = line
          changes.push({ line, ...(await write(row, transaction, line)) })
        }
        if (preview) throw new PreviewDone()
      })
    }
    catch (error) {
      if (error instanceof PreviewDone) { /* rolled back: the changes are the report */ }
      else if (error instanceof UniqueConstraintError)
        rejected.push({
          line: current,
          field: error.errors[0]?.path ?? '(row)',
          message: 'Already in the register (or twice in this file).',
        })
      else if (error instanceof Error && 'statusCode' in error)
        rejected.push({ line: current, field: '(row)', message: error.message })
      else throw error
    }
  }
  if (rejected.length && !preview) {
    throw createError({
      status: 422,
      statusMessage: 'Unprocessable Entity',
      message: `Nothing was imported: ${rejected.length} problem(s) in ${new Set(rejected.map(problem => problem.line)).size} row(s). Correct the file and import it again.`,
      data: { imported: 0, rejected: rejected.sort((a, b) => a.line - b.line) },
    })
  }
  const count = (action: RowChange['action']) => changes.filter(change => change.action === action).length
  const written = rejected.length === 0 && !preview
  return {
    imported: written ? count('added') + count('updated') : 0,
    added: count('added'),
    updated: count('updated'),
    unchanged: count('unchanged'),
    preview,
    changes: rejected.length ? [] : changes,
    rejected: rejected.sort((a, b) => a.line - b.line),
  }
}

/**
 * One imported row by its natural key: the record is added when the key is new, updated in the fields that
 * differ (audited `updated` with each field's from → to) when it is known, left alone when nothing differs.
 */
export async function upsertRow(options: {
  model: ModelStatic<Model>
  where: WhereOptions
  fields: Record<string, unknown>
  key: string
  entity: RecordKindName
  actor: { id: number }
  transaction: Transaction
  /** Fields an import may not change on a known record, with the reason said in the report. */
  fixed?: Record<string, string>
}): Promise<Omit<RowChange, 'line'>> {
  const { model, where, fields, key, entity, actor, transaction } = options
  const known = await model.findOne({ where, transaction, lock: transaction.LOCK.UPDATE })
  if (!known) {
    const created = await model.create(fields, { transaction })
    await appendAudit({ actorId: actor.id, entity, entityId: String(created.get('id')), action: 'imported', detail: fields }, transaction)
    return { key, action: 'added' }
  }
  const changes = changedFields(known, fields)
  for (const [field, reason] of Object.entries(options.fixed ?? {})) {
    if (changes[field]) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `${field}: ${reason}` })
  }
  if (Object.keys(changes).length === 0) return { key, action: 'unchanged' }
  await known.update(Object.fromEntries(Object.entries(changes).map(([field, { to }]) => [field, to])), { transaction })
  await appendAudit(
    { actorId: actor.id, entity, entityId: String(known.get('id')), action: 'updated', detail: { changes, via: 'CSV import' } },
    transaction,
  )
  return { key, action: 'updated', changes }
}
