import { createServer } from 'node:net'

// Below Linux's ephemeral range (32768–60999 by default), which the kernel hands out to outgoing
// connections. A port taken from that range (listen(0)) and closed again can be given to a
// database connection before the test server binds it: the server then cannot listen, and the
// test waits for it in vain. That happened on the PostgreSQL leg, where pools open many
// connections while files start their servers.
const FIRST = 20_000
const LAST = 32_000

function tryPort(port: number): Promise<boolean> {
  return new Promise((done) => {
    const probe = createServer()
    probe.once('error', () => done(false))
    probe.listen(port, '127.0.0.1', () => probe.close(() => done(true)))
  })
}

/** A port that is free now and outside the range used for outgoing connections. */
export async function freePort(): Promise<number> {
  for (let attempt = 0; attempt < 200; attempt++) {
    const port = FIRST + Math.floor(Math.random() * (LAST - FIRST))
    if (await tryPort(port)) return port
  }
  throw new Error(`No free port between ${FIRST} and ${LAST}.`)
}
