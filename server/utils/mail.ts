import nodemailer, { type Transporter } from 'nodemailer'
import { Op } from 'sequelize'
import { outsideTransaction } from '../database/write-queue'
import { Notification } from '../models'
import { retryBackoffMs } from './backoff'

/**
 * E-mail from a durable outbox. `sendMail` only writes the message, `queued`, in the caller's write
 * (or its own) and returns: no request ever waits for an SMTP server. A background worker sends
 * what is due, each message claimed by compare-and-set (several servers never send one twice), with
 * time limits on the SMTP conversation; a failure is retried with exponential backoff and given up
 * (`failed`, for an administrator to see and retry) after MAX_ATTEMPTS. A message left `sending` by
 * a server that died is queued again after a while.
 */

const MAX_ATTEMPTS = 12

let transporter: Transporter | undefined

function settings() {
  const config = useRuntimeConfig()
  const timeoutMs = Number(config.smtpTimeoutSeconds) * 1000 || 20_000
  return { config, timeoutMs, retryMs: Number(config.outboxRetrySeconds) * 1000 || 30_000 }
}

function useTransporter(): Transporter {
  if (transporter) return transporter
  const { config, timeoutMs } = settings()
  const limits = { connectionTimeout: timeoutMs, greetingTimeout: timeoutMs, socketTimeout: timeoutMs }
  // Without an SMTP server (development and tests): the fake one started by server/plugins/fake-smtp.ts.
  const fake = { host: '127.0.0.1', port: Number(config.fakeSmtpPort), secure: false, ignoreTLS: true }
  const server = config.smtpUrl ? { url: String(config.smtpUrl) } : fake
  transporter = nodemailer.createTransport({ ...server, ...limits })
  return transporter
}

export interface MailRequest {
  to: string
  subject: string
  text: string
  kind: string
  worksheetId?: number
}

/** Queues one e-mail in the outbox (in the caller's write when there is one); it is sent in the background. */
export async function sendMail(request: MailRequest): Promise<Notification> {
  return writeTransaction(async (transaction) => {
    const queued = await Notification.create(
      {
        recipient: request.to,
        subject: request.subject,
        body: request.text,
        kind: request.kind,
        worksheetId: request.worksheetId ?? null,
        status: 'queued',
        error: null,
        messageId: null,
        nextAttemptAt: new Date(),
        lastAttemptAt: null,
      },
      { transaction },
    )
    // Not awaited, and outside this write: Sequelize awaits after-commit hooks before the write's turn ends.
    transaction.afterCommit(() => outsideTransaction(() => void setImmediate(() => void kickOutbox())))
    return queued
  })
}

/** The wait before the next try after `attempts` failed ones. */
export function backoffMs(attempts: number, retryMs = settings().retryMs): number {
  return retryBackoffMs(attempts, retryMs)
}

async function deliver(message: Notification): Promise<void> {
  const attempts = message.attempts + 1
  const [claimed] = await writeTransaction(transaction =>
    Notification.update(
      { status: 'sending', attempts, lastAttemptAt: new Date() },
      { where: { id: message.id, status: 'queued' }, transaction },
    ),
  )
  if (!claimed) return
  let outcome: Partial<Notification>
  try {
    const info = await useTransporter().sendMail({
      from: settings().config.mailFrom,
      to: message.recipient,
      subject: message.subject,
      text: message.body,
    })
    outcome = { status: 'sent', error: null, messageId: info.messageId ?? null, nextAttemptAt: null }
  }
  catch (error) {
    const givingUp = attempts >= MAX_ATTEMPTS
    console.error(`Mail to ${message.recipient} failed (attempt ${attempts}${givingUp ? ', giving up' : ''}):`, String(error))
    outcome = givingUp
      ? { status: 'failed', error: String(error), nextAttemptAt: null }
      : { status: 'queued', error: String(error), nextAttemptAt: new Date(Date.now() + backoffMs(attempts)) }
  }
  await writeTransaction(transaction => Notification.update(outcome, { where: { id: message.id }, transaction }))
}

let delivering: Promise<void> | null = null
let again = false

/** Sends what is due now; called after a message is queued, and by the worker's timer. */
export function kickOutbox(): Promise<void> {
  if (delivering) {
    again = true
    return delivering
  }
  delivering = (async () => {
    try {
      do {
        again = false
        const now = new Date()
        // A message a dead server was sending: queued again once it is clearly not being sent.
        const staleBefore = new Date(now.getTime() - 3 * settings().timeoutMs - 60_000)
        await writeTransaction(transaction => Notification.update(
          { status: 'queued', nextAttemptAt: now },
          { where: { status: 'sending', lastAttemptAt: { [Op.lt]: staleBefore } }, transaction },
        ))
        const due = await Notification.findAll({
          where: { status: 'queued', nextAttemptAt: { [Op.lte]: now } },
          order: [['id', 'ASC']],
          limit: 20,
        })
        await Promise.all(due.map(message => deliver(message)))
        if (due.length === 20) again = true
      } while (again)
    }
    catch (error) {
      console.error('The outbox could not be worked through:', error)
    }
    finally {
      delivering = null
    }
  })()
  return delivering
}

/** An administrator sends a failed message again (its attempts start afresh). */
export async function retryMail(id: number): Promise<boolean> {
  const [updated] = await writeTransaction(transaction => Notification.update(
    { status: 'queued', attempts: 0, nextAttemptAt: new Date() },
    { where: { id, status: 'failed' }, transaction },
  ))
  if (updated) void kickOutbox()
  return updated === 1
}
