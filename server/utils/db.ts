import { Op, type Sequelize, type Transaction } from 'sequelize'
import { auditSecretFrom, configureAuditSecret, establishSeal } from '../database/audit-chain'
import { databaseLocation, openDatabase } from '../database/connection'
import { migrate } from '../database/migrate'
import { createWriteQueue, type WriteQueue } from '../database/write-queue'

/** What a start step is given: the open, migrated, sealed database. */
export interface DatabaseStart {
  sequelize: Sequelize
  write: WriteQueue
  location: string
}
const startSteps: ((start: DatabaseStart) => Promise<void>)[] = []

/**
 * Work done once the database is open, migrated and sealed, before any request is served (requests
 * wait for the same opening). Registered by server/plugins/1.database-start.ts, so this file, below
 * the services, imports none of them.
 */
export function onDatabaseStart(step: (start: DatabaseStart) => Promise<void>): void {
  startSteps.push(step)
}

let ready: Promise<{ sequelize: Sequelize, write: WriteQueue }> | undefined
let dialect = 'sqlite'

function open() {
  ready ??= (async () => {
    const config = useRuntimeConfig()
    const location = databaseLocation(config)
    const sequelize = await openDatabase(location)
    dialect = sequelize.getDialect()
    await migrate(sequelize)
    const write = createWriteQueue(sequelize)
    configureAuditSecret(
      auditSecretFrom({ auditSecret: config.auditSecret, sessionPassword: config.session?.password }),
    )
    // Before any request writes: a chain that was never sealed is baselined and sealed now.
    const { established, baselined } = await write(transaction => establishSeal(transaction))
    if (established) console.info(`Audit chain sealed; ${baselined} record(s) baselined.`)
    for (const step of startSteps) await step({ sequelize, write, location })
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

/** Writes waiting for their turn in the single-writer queue now (for the metrics). */
export async function writesWaiting(): Promise<number> {
  return (await open()).write.waiting
}

/** Case-insensitive LIKE on either database (SQLite's LIKE already is, for ASCII; PostgreSQL's is not). */
export function likeOperator(): typeof Op.like | typeof Op.iLike {
  return dialect === 'postgres' ? Op.iLike : Op.like
}
