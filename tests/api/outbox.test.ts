/**
 * Mail from a durable outbox: with an SMTP server that accepts the connection and never answers,
 * the action that sends mail answers at once; the message waits in the outbox with its attempts and
 * next try, and is delivered once the SMTP server answers again, once.
 */
import { createServer, type Server, type Socket } from 'node:net'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import { afterAll, beforeAll, describe, expect, it, onTestFailed } from 'vitest'
import { DEMO, signInAt } from '../support/api'
import { freePort } from '../support/ports'
import { startTestServer, type TestServer } from '../support/test-server'

const SMTP_TIMEOUT_SECONDS = 8
let server: TestServer
let smtpPort: number
let hanging: Server
const sockets: Socket[] = []
beforeAll(async () => {
  smtpPort = await freePort()
  // Accepts every connection and never says a word (a mail relay that has hung).
  hanging = createServer(socket => void sockets.push(socket))
  await new Promise<void>(listening => hanging.listen(smtpPort, '127.0.0.1', listening))
  server = await startTestServer({
    NUXT_FAKE_SMTP: '',
    NUXT_SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    NUXT_SMTP_TIMEOUT_SECONDS: String(SMTP_TIMEOUT_SECONDS),
    NUXT_OUTBOX_RETRY_SECONDS: '1',
  })
}, 60_000)
afterAll(async () => {
  await server?.dispose()
  for (const socket of sockets) socket.destroy()
  hanging?.close()
})

const signIn = (email: string) => signInAt(server.baseURL, email)
const get = async (path: string, cookie: string) => (await fetch(`${server.baseURL}${path}`, { headers: { cookie } })).json()

describe('an SMTP server that hangs', () => {
  it('never holds up the request; the message is retried and delivered once SMTP answers again', { timeout: 90_000 }, async () => {
    const inspector = await signIn(DEMO.inspector)
    const admin = await signIn(DEMO.admin)
    const queue = await get('/api/worksheets?state=awaiting-countersign&pageSize=5', inspector)
    const id = queue.items[0].id as number
    const returned = await fetch(`${server.baseURL}/api/worksheets/${id}/return`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'cookie': inspector },
      body: JSON.stringify({ reason: 'Gauge photo missing; attach it and sign again.' }),
    })
    expect(returned.status).toBe(200)
    const mine = async () => ((await get('/api/admin/outbox', admin)).notifications as { subject: string, status: string, attempts: number, nextAttemptAt: string | null, error: string | null }[])
      .find(message => message.subject.startsWith(`Worksheet ${id} returned`))
    // Not held for the SMTP conversation (no clock read): answered while no attempt has ended — a request that
    // waited for the hanging relay would have answered after its first attempt timed out and left its error.
    expect(await mine()).toMatchObject({ error: null })
    onTestFailed(() => console.error(server.log.join('')))
    // The first attempt times out and is put back with its next try.
    await expect.poll(async () => (await mine())?.attempts ?? 0, { timeout: 30_000 }).toBeGreaterThanOrEqual(1)
    await expect.poll(async () => (await mine())?.status, { timeout: 30_000 }).toBe('queued')
    expect((await mine())!.error).toBeTruthy()
    expect((await mine())!.nextAttemptAt).toBeTruthy()

    // The relay comes back on the same port.
    for (const socket of sockets) socket.destroy()
    await new Promise<void>(closed => hanging.close(() => closed()))
    const received: string[] = []
    const relay = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      onData(stream, _session, done) {
        let text = ''
        stream.on('data', (chunk: Buffer) => (text += chunk.toString()))
        stream.on('end', () => {
          received.push(text)
          done()
        })
      },
    })
    await new Promise<void>(listening => relay.listen(smtpPort, '127.0.0.1', listening))
    try {
      await expect.poll(async () => (await mine())?.status, { timeout: 45_000 }).toBe('sent')
      const subjects = await Promise.all(received.map(async raw => (await simpleParser(raw)).subject ?? ''))
      expect(subjects.filter(subject => subject.startsWith(`Worksheet ${id} returned`))).toHaveLength(1)
      expect((await mine())!.attempts).toBeGreaterThanOrEqual(2)
    }
    finally {
      await new Promise<void>(closed => relay.close(() => closed()))
    }
  })
})
