import {
  Op,
  UniqueConstraintError,
  literal,
  type FindOptions,
  type Model,
  type ModelStatic,
  type WhereOptions,
} from 'sequelize'
import { Worksheet } from '../models'

/** Text for a LIKE pattern with its % and _ (and the escape character itself) taken as themselves. */
export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, match => `\\${match}`)
}

/**
 * `q` as a case-insensitive "contains" over some columns, on SQLite and PostgreSQL alike; % and _ are taken as
 * themselves.
 */
export function searchWhere(q: string | undefined, fields: string[]): WhereOptions {
  if (!q) return {}
  const pattern = `%${escapeLike(q)}%`
  return {
    [Op.or]: fields.map(field => ({
      [field]: { [likeOperator()]: literal(`${Worksheet.sequelize!.escape(pattern)} ESCAPE '\\'`) },
    })),
  }
}

/** A register counts its matches up to this many ("10,000+" beyond): a bounded read, never a scan of the table. */
export const REGISTER_COUNT_CAP = 10_000

/** Does a where clause name an included model's column (`$aircraft.base$`)? */
export function namesIncluded(where: unknown): boolean {
  if (!where || typeof where !== 'object') return false
  const keys = [...Object.keys(where), ...Object.getOwnPropertySymbols(where)]
  return keys.some(key => (typeof key === 'string' && key.startsWith('$'))
    || namesIncluded((where as Record<string | symbol, unknown>)[key]))
}

/**
 * One page of a register and how many match, counted up to REGISTER_COUNT_CAP (`totalCapped` beyond):
 * a full count of a register of a million rows (cycle checks, the audit trail) took half a second.
 * Pages stop at the cap, so an offset never walks further than it.
 */
export async function pageOf<M extends Model>(
  model: ModelStatic<M>,
  options: FindOptions & { page: number, pageSize: number },
): Promise<{ total: number, totalCapped: boolean, rows: M[] }> {
  const { page, pageSize, ...find } = options
  const offset = (page - 1) * pageSize
  if (offset >= REGISTER_COUNT_CAP) {
    throw createError({
      status: 400,
      statusMessage: 'Bad Request',
      message: `Only the first ${REGISTER_COUNT_CAP} matches can be paged through: narrow the search or the filters.`,
      data: { issues: [{ path: ['page'], field: 'page', message: `At most page ${Math.ceil(REGISTER_COUNT_CAP / pageSize)} at this page size.` }] },
    })
  }
  const rows = await model.findAll({ ...find, limit: pageSize, offset })
  // The count reads at most cap + 1 keys; an included model joins only where the filter names it
  // (those are belongs-to links, one row each).
  const counted = await model.findAll({
    where: find.where,
    include: namesIncluded(find.where) ? find.include : undefined,
    attributes: [model.primaryKeyAttribute],
    limit: REGISTER_COUNT_CAP + 1,
    raw: true,
    subQuery: false,
  })
  return { total: Math.min(counted.length, REGISTER_COUNT_CAP), totalCapped: counted.length > REGISTER_COUNT_CAP, rows }
}

/** Runs a write; a unique-constraint clash becomes 409 with a plain reason. */
export async function uniqueOr409<T>(write: () => Promise<T>, message: string): Promise<T> {
  try {
    return await write()
  }
  catch (error) {
    if (error instanceof UniqueConstraintError)
      throw createError({ status: 409, statusMessage: 'Conflict', message, data: { field: error.errors[0]?.path } })
    throw error
  }
}
