import pg from 'pg'

/**
 * With several servers on one PostgreSQL database, a change that ends or alters a user's
 * sessions on one server must reach the others' session caches at once: each server LISTENs
 * on one channel, and a change is NOTIFYed on it (after its write commits). One LISTEN connection
 * per server, always: when it drops (a database restart fires both `error` and `end`), it is
 * closed and replaced once, after a backoff that grows to 30 s while the database stays away and
 * starts again at 1 s once it is back. While it is down each server's cache still expires in seconds.
 */
const CHANNEL = 'chargewell_sessions'
const FIRST_RETRY_MS = 1000
const LAST_RETRY_MS = 30_000

export function listenForSessionChanges(url: string, onChange: (userId: number) => void): (userId: number) => void {
  let client: pg.Client | undefined
  let closed = false
  let wait = FIRST_RETRY_MS
  const connect = () => {
    if (closed) return
    const next = new pg.Client({ connectionString: url })
    let lost = false
    // Whatever says this connection is gone (error, end, a failed connect), it is replaced once.
    const replace = () => {
      if (lost) return
      lost = true
      if (client === next) client = undefined
      next.end().catch(() => undefined)
      if (closed) return
      setTimeout(connect, wait).unref()
      wait = Math.min(LAST_RETRY_MS, wait * 2)
    }
    next.on('notification', (message) => {
      const userId = Number(message.payload)
      if (Number.isInteger(userId)) onChange(userId)
    })
    next.on('error', replace)
    next.on('end', replace)
    next.connect().then(() => next.query(`LISTEN ${CHANNEL}`)).then(() => {
      if (lost) return
      client = next
      wait = FIRST_RETRY_MS
    }, replace)
  }
  connect()
  process.once('beforeExit', () => {
    closed = true
    void client?.end()
  })
  return (userId) => {
    client?.query('SELECT pg_notify($1, $2)', [CHANNEL, String(userId)]).catch(() => undefined)
  }
}
