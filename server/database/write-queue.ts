import { AsyncLocalStorage } from 'node:async_hooks'
import { Transaction, type Sequelize } from 'sequelize'

/**
 * One writer at a time. SQLite allows a single writer; when two deferred transactions both
 * read and then both try to write, one fails at once with SQLITE_BUSY (the busy timeout
 * cannot help a deadlock). So every write in this process runs through one queue, in a
 * `BEGIN IMMEDIATE` transaction that takes the write lock up front (and waits on the busy
 * timeout for any other process, such as a seed run). Reads stay outside the queue and run
 * in parallel with it (WAL). On PostgreSQL the queue is not needed: rows are locked instead.
 *
 * A write started inside another joins it (same transaction), so services can compose.
 */
export interface WriteQueue {
  <T>(work: (transaction: Transaction) => Promise<T>): Promise<T>
  /** Writes waiting for their turn (for the health report and benchmarks). */
  readonly waiting: number
}

export function createWriteQueue(sequelize: Sequelize): WriteQueue {
  const current = new AsyncLocalStorage<Transaction>()
  const serialise = sequelize.getDialect() === 'sqlite'
  let tail: Promise<unknown> = Promise.resolve()
  let waiting = 0

  const run = <T>(work: (transaction: Transaction) => Promise<T>): Promise<T> => {
    const joined = current.getStore()
    if (joined) return work(joined)
    const start = () => sequelize.transaction(
      serialise ? { type: Transaction.TYPES.IMMEDIATE } : {},
      transaction => current.run(transaction, () => work(transaction)),
    )
    if (!serialise) return start()
    waiting++
    const turn = tail.then(() => {
      waiting--
      return start()
    })
    // The next writer waits for this one to settle, whether it committed or rolled back.
    tail = turn.catch(() => undefined)
    return turn
  }
  Object.defineProperty(run, 'waiting', { get: () => waiting })
  return run as WriteQueue
}
