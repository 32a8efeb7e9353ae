import { createServer } from 'node:net'

// Below Linux's ephemeral range (32768–60999 by default), which the kernel hands out to outgoing
// connections. A port taken from that range (listen(0)) and closed again can be given to a
// database connection before the test server binds it: the server then cannot listen, and the
// test waits for it in vain. That happened on the PostgreSQL leg, where pools open many
// connections while files start their servers.
// CHARGEWELL_TEST_PORTS=from-to moves the whole range, so a second checkout's suite can run beside this one.
const [FIRST, LAST] = (process.env.CHARGEWELL_TEST_PORTS ?? '20000-32000').split('-').map(Number) as [number, number]
// Each vitest worker draws from its own slice of that range. A probe only proves a port free at
// that instant: two files in two workers could both probe the same port free before either server
// binds it (CI saw EADDRINUSE on a test server's port that way). Within a worker, files run one
// after another, and this module hands a port out once per file.
const SLICE = 1_000
const SLICES = (LAST - FIRST) / SLICE
const pool = Number(process.env.VITEST_POOL_ID)
const [low, high] = Number.isInteger(pool) && pool >= 1 && pool <= SLICES
  ? [FIRST + (pool - 1) * SLICE, FIRST + pool * SLICE]
  : [FIRST, LAST]
const handedOut = new Set<number>()

function tryPort(port: number): Promise<boolean> {
  return new Promise((done) => {
    const probe = createServer()
    probe.once('error', () => done(false))
    probe.listen(port, '127.0.0.1', () => probe.close(() => done(true)))
  })
}

/** A port that is free now, outside the range used for outgoing connections, and not handed to another worker. */
export async function freePort(): Promise<number> {
  for (let attempt = 0; attempt < 200; attempt++) {
    const port = low + Math.floor(Math.random() * (high - low))
    if (handedOut.has(port)) continue
    if (await tryPort(port)) {
      handedOut.add(port)
      return port
    }
  }
  throw new Error(`No free port between ${low} and ${high}.`)
}
