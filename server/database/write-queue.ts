import { AsyncLocalStorage } from 'node:async_hooks'
import { Sequelize, Transaction } from 'sequelize'

/**
 * One writer at a time. SQLite allows a single writer; when two deferred transactions both
 * read and then both try to write, one fails at once with SQLITE_BUSY (the busy timeout
 * cannot help a deadlock). So every write in this process runs through one queue, in a
 * `BEGIN IMMEDIATE` transaction that takes the write lock up front (and waits on the busy
 * timeout for any other process, such as a seed run). Reads stay outside the queue and run
 * in parallel with it (WAL). On PostgreSQL the queue is not needed: rows are locked instead.
 *
 * A write started inside another joins it (same transaction), so services can compose. And every
 * query made while a write runs — a read of the tool register in the middle of a step save, say —
 * runs in that write's transaction even where the call forgets `{ transaction }`: Sequelize's own
 * continuation-local mechanism (`Sequelize.useCLS`), given Node's AsyncLocalStorage as its
 * namespace. Without it, on PostgreSQL such a read takes a second pooled connection while the
 * first is held, and enough parallel writers exhaust the pool and wait on each other for ever.
 */
export interface WriteQueue {
  <T>(work: (transaction: Transaction) => Promise<T>): Promise<T>
  /** Writes waiting for their turn (for the health report and benchmarks). */
  readonly waiting: number
}

const context = new AsyncLocalStorage<Map<string, unknown>>()
/** The namespace interface Sequelize asks of `useCLS` (that of cls-hooked), on AsyncLocalStorage. */
const namespace = {
  run: (work: (values: Map<string, unknown>) => void) => {
    const values = new Map<string, unknown>()
    context.run(values, () => work(values))
  },
  bind: <F>(work: F) => work,
  get: (key: string) => context.getStore()?.get(key),
  set: (key: string, value: unknown) => context.getStore()?.set(key, value),
}

let waitObserver: (seconds: number) => void = () => undefined

/** Told how long each write waited for its turn (the metrics' write-queue wait). */
export function observeWriteWaits(observer: (seconds: number) => void): void {
  waitObserver = observer
}

export function createWriteQueue(sequelize: Sequelize): WriteQueue {
  Sequelize.useCLS(namespace)
  const serialise = sequelize.getDialect() === 'sqlite'
  let tail: Promise<unknown> = Promise.resolve()
  let waiting = 0

  const run = <T>(work: (transaction: Transaction) => Promise<T>): Promise<T> => {
    // Set while a transaction is open in this async context, cleared when it ends.
    const joined = namespace.get('transaction') as Transaction | null | undefined
    if (joined) return work(joined)
    const start = () => sequelize.transaction(serialise ? { type: Transaction.TYPES.IMMEDIATE } : {}, work)
    if (!serialise) {
      waitObserver(0)
      return start()
    }
    waiting++
    const queuedAt = performance.now()
    const turn = tail.then(() => {
      waiting--
      waitObserver((performance.now() - queuedAt) / 1000)
      return start()
    })
    // The next writer waits for this one to settle, whether it committed or rolled back.
    tail = turn.catch(() => undefined)
    return turn
  }
  Object.defineProperty(run, 'waiting', { get: () => waiting })
  return run as WriteQueue
}

/** The write transaction open in this async context, if any. */
export function activeTransaction(): Transaction | undefined {
  return (namespace.get('transaction') as Transaction | null | undefined) ?? undefined
}

/** Runs `work` outside any write this context is in (news of a refused write must not join its rollback). */
export function outsideTransaction<T>(work: () => T): T {
  return context.exit(work)
}
