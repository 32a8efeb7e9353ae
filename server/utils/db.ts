import type { Sequelize, Transaction } from 'sequelize'
import { auditSecretFrom, configureAuditSecret, establishSeal } from '../database/audit-chain'
import { openDatabase } from '../database/connection'
import { migrate } from '../database/migrate'
import { createWriteQueue, type WriteQueue } from '../database/write-queue'

let ready: Promise<{ sequelize: Sequelize, write: WriteQueue }> | undefined

function open() {
  ready ??= (async () => {
    const config = useRuntimeConfig()
    const sequelize = await openDatabase(config.dbPath)
    await migrate(sequelize)
    const write = createWriteQueue(sequelize)
    configureAuditSecret(auditSecretFrom({ auditSecret: config.auditSecret, sessionPassword: config.session?.password }))
    // Before any request writes: a chain that was never sealed is baselined and sealed now.
    const { established, baselined } = await write(transaction => establishSeal(transaction))
    if (established) console.info(`Audit chain sealed; ${baselined} record(s) baselined.`)
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
  return (await open()).write(work)
}
