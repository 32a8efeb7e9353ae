import { mkdirSync } from 'node:fs'
import { dirname } from 'node:path'
import { Sequelize } from 'sequelize'
// Imported statically and handed to Sequelize: its own dynamic require is not followed by
// the server bundler, and the built server would then fail when run from a copy elsewhere.
import sqlite3 from 'sqlite3'
import pg from 'pg'
import { initModels } from '../models'
import { installRecordGuards } from './record-guard'

export const DEFAULT_DB_PATH = 'data/chargewell.sqlite'

/** Where the database is: NUXT_DATABASE_URL (postgres://…) when set, else the SQLite file NUXT_DB_PATH. */
export function databaseLocation(settings: { databaseUrl?: string | null, dbPath?: string | null }): string {
  return settings.databaseUrl || settings.dbPath || DEFAULT_DB_PATH
}

export function isPostgresUrl(location: string): boolean {
  return /^postgres(ql)?:\/\//.test(location)
}

/**
 * Opens the database: PostgreSQL for a postgres:// URL (several servers can share it), else
 * the SQLite file at that path (creating its folder), in WAL mode with a busy timeout.
 */
export async function openDatabase(location: string): Promise<Sequelize> {
  if (isPostgresUrl(location)) {
    const sequelize = new Sequelize(location, {
      dialect: 'postgres',
      dialectModule: pg,
      logging: false,
      pool: { max: Number(process.env.NUXT_DATABASE_POOL ?? 10), min: 0, idle: 10_000 },
    })
    await sequelize.authenticate()
    initModels(sequelize)
    installRecordGuards()
    return sequelize
  }
  const path = location
  if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true })
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    dialectModule: sqlite3,
    storage: path,
    logging: false,
    // One connection: SQLite serialises writes anyway, and transactions stay on one handle.
    pool: { max: 1, min: 0, idle: 10_000 },
    retry: { max: 5, match: [/SQLITE_BUSY/] },
    hooks: {
      // SQLite settings are per connection, and Sequelize opens one per transaction: set them on each.
      afterConnect: async (connection) => {
        const database = connection as unknown as { run: (sql: string, done: (error: Error | null) => void) => void }
        for (const pragma of ['PRAGMA busy_timeout = 15000', 'PRAGMA foreign_keys = ON']) {
          await new Promise<void>((done, fail) => database.run(pragma, error => error ? fail(error) : done()))
        }
      },
    },
  })
  await sequelize.query('PRAGMA journal_mode = WAL')
  initModels(sequelize)
  installRecordGuards()
  return sequelize
}
