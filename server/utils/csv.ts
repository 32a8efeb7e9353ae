import { Readable } from 'node:stream'
import type { H3Event } from 'h3'
import Papa from 'papaparse'

/**
 * Every CSV Chargewell writes goes through here. A text cell that a spreadsheet would run as a
 * formula (starting with = + - @, a tab or a carriage return, or their full-width forms) gets a
 * leading apostrophe, as OWASP's CSV injection guidance advises; numbers stay numbers. Papa's
 * own default pattern stops at a line break, so a two-line "=..." cell would slip through: ours
 * looks at the first character only. Imports strip that apostrophe again (`unguardCell`).
 */
export const FORMULA_START = /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/

export function csvText(columns: string[], rows: unknown[][], options: { header?: boolean } = {}): string {
  const header = options.header ?? true
  return Papa.unparse({ fields: header ? columns : [], data: rows }, { escapeFormulae: FORMULA_START, header, newline: '\r\n' })
}

/** A cell as an import reads it: the apostrophe an export put before a formula character is taken off. */
export function unguardCell(value: string): string {
  return value.replace(/^'(?=[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20])/, '')
}

function download(event: H3Event, name: string): void {
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-${name}-${stationToday()}.csv"`)
}

/** Rows (objects) as a CSV download with these columns, in this order. */
export function sendCsv(event: H3Event, name: string, rows: Record<string, unknown>[], columns: string[]): string {
  download(event, name)
  return csvText(columns, rows.map(row => columns.map(column => row[column] ?? '')))
}

/** A CSV download of any size: the header, then each batch of rows as it comes. */
export function streamCsv(event: H3Event, name: string, columns: string[], batches: AsyncIterable<unknown[][]>) {
  download(event, name)
  return sendStream(event, Readable.from((async function* () {
    yield csvText(columns, []).replace(/\r\n$/, '')
    for await (const rows of batches) if (rows.length) yield `\r\n${csvText(columns, rows, { header: false })}`
  })()))
}
