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

/**
 * `q` as a case-insensitive "contains" over some columns, on SQLite and PostgreSQL alike; % and _ are taken as
 * themselves.
 */
export function searchWhere(q: string | undefined, fields: string[]): WhereOptions {
  if (!q) return {}
  const pattern = `%${q.replace(/[\\%_]/g, match => `\\${match}`)}%`
  return {
    [Op.or]: fields.map(field => ({
      [field]: { [likeOperator()]: literal(`${Worksheet.sequelize!.escape(pattern)} ESCAPE '\\'`) },
    })),
  }
}

/** One page of a register and the total that matches. */
export async function pageOf<M extends Model>(
  model: ModelStatic<M>,
  options: FindOptions & { page: number, pageSize: number },
): Promise<{ total: number, rows: M[] }> {
  const { page, pageSize, ...find } = options
  const { rows, count } = await model.findAndCountAll({
    ...find,
    limit: pageSize,
    offset: (page - 1) * pageSize,
    distinct: true,
  })
  return { total: count, rows }
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
