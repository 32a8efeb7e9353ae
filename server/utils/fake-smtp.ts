import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

export interface ReceivedMail {
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
  raw: string
}

const received: ReceivedMail[] = []
let server: SMTPServer | undefined

/** What the local fake SMTP server has received since the server started, newest first. */
export function fakeInbox(): ReceivedMail[] {
  return [...received].reverse()
}

/** Starts a catching SMTP server on 127.0.0.1 (development and tests only). */
export function startFakeSmtp(port: number): Promise<void> {
  if (server) return Promise.resolve()
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('end', async () => {
        const raw = Buffer.concat(chunks)
        const parsed = await simpleParser(raw).catch(() => undefined)
        received.push({
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map(recipient => recipient.address),
          subject: parsed?.subject ?? '',
          text: parsed?.text ?? '',
          raw: raw.toString('utf8'),
        })
        if (received.length > 500) received.shift()
        callback()
      })
    },
  })
  return new Promise((done, fail) => {
    server!.once('error', fail)
    server!.listen(port, '127.0.0.1', () => done())
  })
}
