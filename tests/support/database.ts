import pg from 'pg'
import sqlite3 from 'sqlite3'
import { isPostgresUrl } from './postgres'

/**
 * Direct access to a test server's database (a SQLite file or a postgres:// URL), as someone
 * with the database (and not the application) would have it: for tamper tests. Placeholders
 * are `?` for both.
 */
export async function sql<Row = Record<string, unknown>>(
  database: string,
  statement: string,
  parameters: unknown[] = [],
): Promise<Row[]> {
  if (isPostgresUrl(database)) {
    const client = new pg.Client({ connectionString: database })
    await client.connect()
    try {
      let index = 0
      // pg would send a JS array as a PostgreSQL array; the app's JSON columns want JSON.
      const values = parameters.map(value =>
        value && typeof value === 'object' && !(value instanceof Date) && !Buffer.isBuffer(value)
          ? JSON.stringify(value)
          : value,
      )
      return (
        await client.query(
          statement.replace(/\?/g, () => `$${++index}`),
          values,
        )
      ).rows as Row[]
    }
    finally {
      await client.end()
    }
  }
  const connection = new sqlite3.Database(database)
  try {
    await new Promise<void>((done, fail) =>
      connection.run('PRAGMA busy_timeout = 10000', error => (error ? fail(error) : done())),
    )
    return await new Promise<Row[]>((done, fail) =>
      connection.all(statement, parameters, (error, rows) => (error ? fail(error) : done(rows as Row[]))),
    )
  }
  finally {
    await new Promise<void>(done => connection.close(() => done()))
  }
}

/** A JSON column's value as text, whichever database gave it (PostgreSQL parses it, SQLite does not). */
export function asText(value: unknown): string {
  return typeof value === 'string' ? value : JSON.stringify(value)
}
