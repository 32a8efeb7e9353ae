import { Op, type Sequelize, type Transaction } from 'sequelize'
import { auditSecretFrom, configureAuditSecret, establishSeal } from '../database/audit-chain'
import { databaseLocation, isPostgresUrl, openDatabase } from '../database/connection'
import { listenForSessionChanges } from '../database/session-broadcast'
import { rebuildTrends } from '../database/trend-store'
import { Accumulator, CycleCheck, SystemCycleTrend, UnitTrend } from '../models'
import { forgetSessions, onSessionChangeBroadcast } from '../services/sessions'
import { rebuildCycleTrends } from '../services/trends'
import { migrate } from '../database/migrate'
import { createWriteQueue, type WriteQueue } from '../database/write-queue'

let ready: Promise<{ sequelize: Sequelize, write: WriteQueue }> | undefined
let dialect = 'sqlite'

function open() {
  ready ??= (async () => {
    const config = useRuntimeConfig()
    const location = databaseLocation(config)
    const sequelize = await openDatabase(location)
    dialect = sequelize.getDialect()
    if (isPostgresUrl(location)) onSessionChangeBroadcast(listenForSessionChanges(location, forgetSessions))
    await migrate(sequelize)
    const write = createWriteQueue(sequelize)
    configureAuditSecret(
      auditSecretFrom({ auditSecret: config.auditSecret, sessionPassword: config.session?.password }),
    )
    // Before any request writes: a chain that was never sealed is baselined and sealed now.
    const { established, baselined } = await write(transaction => establishSeal(transaction))
    if (established) console.info(`Audit chain sealed; ${baselined} record(s) baselined.`)
    // Stored trends missing (a database from before them, or loaded in bulk): derive them once.
    if ((await UnitTrend.count()) === 0 && (await Accumulator.count()) > 0) {
      const released = await rebuildTrends(write)
      console.info(`Pre-charge trends derived from ${released} released worksheet(s).`)
    }
    if ((await SystemCycleTrend.count()) === 0 && (await CycleCheck.count({ where: { withdrawnAt: null } })) > 0) {
      const systems = await rebuildCycleTrends(write)
      console.info(`Pump-cycle trends derived for ${systems} system(s).`)
    }
    return { sequelize, write }
  })().catch((error) => {
    ready = undefined
    throw error
  })
  return ready
}

/** The migrated database connection, opened once per server process. */
export async function useDB(): Promise<Sequelize> {
  return (await open()).sequelize
}

/**
 * Runs writes that belong together in one transaction, one writer at a time (see
 * server/database/write-queue.ts): concurrent writers wait their turn instead of failing.
 * Every write in the server goes through here.
 */
export async function writeTransaction<T>(work: (transaction: Transaction) => Promise<T>): Promise<T> {
  const { write } = await open()
  try {
    const result = await write(work)
    writeSucceeded()
    return result
  }
  catch (error) {
    throw asStorageFault(error)
  }
}

/** Case-insensitive LIKE on either database (SQLite's LIKE already is, for ASCII; PostgreSQL's is not). */
export function likeOperator(): typeof Op.like | typeof Op.iLike {
  return dialect === 'postgres' ? Op.iLike : Op.like
}
