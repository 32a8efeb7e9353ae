import { Op, UniqueConstraintError, type FindOptions, type Model, type ModelStatic, type WhereOptions } from 'sequelize'
import Papa from 'papaparse'
import type { H3Event } from 'h3'

/** `q` as a case-insensitive "contains" over some columns (LIKE works on SQLite and PostgreSQL alike). */
export function searchWhere(q: string | undefined, fields: string[]): WhereOptions {
  if (!q) return {}
  return { [Op.or]: fields.map(field => ({ [field]: { [Op.like]: `%${q}%` } })) }
}

/** One page of a register and the total that matches. */
export async function pageOf<M extends Model>(model: ModelStatic<M>, options: FindOptions & { page: number, pageSize: number }): Promise<{ total: number, rows: M[] }> {
  const { page, pageSize, ...find } = options
  const { rows, count } = await model.findAndCountAll({ ...find, limit: pageSize, offset: (page - 1) * pageSize, distinct: true })
  return { total: count, rows }
}

/** Sends rows as a CSV download whose header row is the import format. */
export function sendCsv(event: H3Event, name: string, rows: Record<string, unknown>[], columns: string[]): string {
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-${name}-${new Date().toISOString().slice(0, 10)}.csv"`)
  return Papa.unparse({ fields: columns, data: rows.map(row => columns.map(column => row[column] ?? '')) })
}

/** Runs a write; a unique-constraint clash becomes 409 with a plain reason. */
export async function uniqueOr409<T>(write: () => Promise<T>, message: string): Promise<T> {
  try {
    return await write()
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) throw createError({ status: 409, statusMessage: 'Conflict', message, data: { field: error.errors[0]?.path } })
    throw error
  }
}
