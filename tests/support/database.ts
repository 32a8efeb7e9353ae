import sqlite3 from 'sqlite3'

/**
 * Direct access to a test server's database file, as someone with the file (and not the
 * application) would have it: for tamper tests.
 */
export async function sql<Row = Record<string, unknown>>(path: string, statement: string, parameters: unknown[] = []): Promise<Row[]> {
  const database = new sqlite3.Database(path)
  try {
    await new Promise<void>((done, fail) => database.run('PRAGMA busy_timeout = 10000', error => error ? fail(error) : done()))
    return await new Promise<Row[]>((done, fail) => database.all(statement, parameters, (error, rows) => error ? fail(error) : done(rows as Row[])))
  }
  finally {
    await new Promise<void>(done => database.close(() => done()))
  }
}
