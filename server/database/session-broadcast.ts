import pg from 'pg'

/**
 * With several servers on one PostgreSQL database, a change that ends or alters a user's
 * sessions on one server must reach the others' session caches at once: each server LISTENs
 * on one channel, and a change is NOTIFYed on it (after its write commits). The connection is
 * re-opened if it drops; while it is down each server's cache still expires in seconds.
 */
const CHANNEL = 'chargewell_sessions'

export function listenForSessionChanges(url: string, onChange: (userId: number) => void): (userId: number) => void {
  let client: pg.Client | undefined
  let closed = false
  const connect = () => {
    const next = new pg.Client({ connectionString: url })
    next.on('notification', (message) => {
      const userId = Number(message.payload)
      if (Number.isInteger(userId)) onChange(userId)
    })
    const retry = () => {
      if (client === next) client = undefined
      if (!closed) setTimeout(connect, 1000).unref()
    }
    next.on('error', retry)
    next.on('end', retry)
    next.connect().then(() => next.query(`LISTEN ${CHANNEL}`)).then(() => {
      client = next
    }, retry)
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
