import { mkdirSync } from 'node:fs'
import { dirname } from 'node:path'
import { Sequelize } from 'sequelize'
// Imported statically and handed to Sequelize: its own dynamic require is not followed by
// the server bundler, and the built server would then fail when run from a copy elsewhere.
import sqlite3 from 'sqlite3'
import { initModels } from '../models'

export const DEFAULT_DB_PATH = 'data/chargewell.sqlite'

/** Opens the database at a path (creating its folder), in WAL mode with a busy timeout. */
export async function openDatabase(path: string): Promise<Sequelize> {
  if (path !== ':memory:') mkdirSync(dirname(path), { recursive: true })
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    dialectModule: sqlite3,
    storage: path,
    logging: false,
    // One connection: SQLite serialises writes anyway, and transactions stay on one handle.
    pool: { max: 1, min: 0, idle: 10_000 },
    retry: { max: 5, match: [/SQLITE_BUSY/] },
  })
  await sequelize.query('PRAGMA journal_mode = WAL')
  await sequelize.query('PRAGMA busy_timeout = 5000')
  await sequelize.query('PRAGMA foreign_keys = ON')
  initModels(sequelize)
  return sequelize
}
