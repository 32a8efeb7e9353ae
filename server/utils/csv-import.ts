import type { H3Event } from 'h3'
import Papa from 'papaparse'
import { UniqueConstraintError, type Transaction } from 'sequelize'
import type { ZodType, ZodTypeDef } from 'zod'
import { toFieldIssues } from '#shared/schemas/issues'

export interface RejectedRow {
  /** The line in the file (the header is line 1). */
  line: number
  field: string
  message: string
}

export interface ImportReport {
  imported: number
  rejected: RejectedRow[]
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
 * with a line-by-line report, and nothing is imported.
 */
export async function importCsv<Row>(
  event: H3Event,
  schema: ZodType<Row, ZodTypeDef, unknown>,
  write: (row: Row, transaction: Transaction, line: number) => Promise<void>,
  check?: (row: Row, line: number) => Promise<RejectedRow[]>,
): Promise<ImportReport> {
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
  if (rejected.length === 0) {
    let current = 0
    try {
      await writeTransaction(async (transaction) => {
        for (const { row, line } of rows) {
          current = line
          await write(row, transaction, line)
        }
      })
    }
    catch (error) {
      if (error instanceof UniqueConstraintError)
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
  if (rejected.length) {
    throw createError({
      status: 422,
      statusMessage: 'Unprocessable Entity',
      message: `Nothing was imported: ${rejected.length} problem(s) in ${new Set(rejected.map(problem => problem.line)).size} row(s). Correct the file and import it again.`,
      data: { imported: 0, rejected: rejected.sort((a, b) => a.line - b.line) },
    })
  }
  return { imported: rows.length, rejected: [] }
}
