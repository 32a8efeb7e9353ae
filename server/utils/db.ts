import type { Sequelize } from 'sequelize'
import { openDatabase } from '../database/connection'
import { migrate } from '../database/migrate'

let ready: Promise<Sequelize> | undefined

/** The migrated database connection, opened once per server process. */
export function useDB(): Promise<Sequelize> {
  ready ??= (async () => {
    const sequelize = await openDatabase(useRuntimeConfig().dbPath)
    await migrate(sequelize)
    return sequelize
  })().catch((error) => {
    ready = undefined
    throw error
  })
  return ready
}
