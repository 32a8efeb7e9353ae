import nodemailer, { type Transporter } from 'nodemailer'
import { Notification } from '../models'

let transporter: Transporter | undefined

function useTransporter(): Transporter {
  if (transporter) return transporter
  const config = useRuntimeConfig()
  // Without an SMTP server (development and tests): the fake one started by server/plugins/fake-smtp.ts.
  const fake = { host: '127.0.0.1', port: Number(config.fakeSmtpPort), secure: false, ignoreTLS: true }
  transporter = config.smtpUrl ? nodemailer.createTransport(config.smtpUrl) : nodemailer.createTransport(fake)
  return transporter
}

export interface MailRequest {
  to: string
  subject: string
  text: string
  kind: string
  worksheetId?: number
}

/**
 * Sends one e-mail and records it in the Outbox. A mail failure never undoes the work that
 * caused it: it is recorded as failed, with the error, for an admin to see.
 */
export async function sendMail(request: MailRequest): Promise<Notification> {
  const config = useRuntimeConfig()
  try {
    const info = await useTransporter().sendMail({
      from: config.mailFrom,
      to: request.to,
      subject: request.subject,
      text: request.text,
    })
    return await writeTransaction(transaction =>
      Notification.create(
        {
          recipient: request.to,
          subject: request.subject,
          body: request.text,
          kind: request.kind,
          worksheetId: request.worksheetId ?? null,
          status: 'sent',
          error: null,
          messageId: info.messageId ?? null,
        },
        { transaction },
      ),
    )
  }
  catch (error) {
    console.error(`Mail to ${request.to} failed:`, error)
    return await writeTransaction(transaction =>
      Notification.create(
        {
          recipient: request.to,
          subject: request.subject,
          body: request.text,
          kind: request.kind,
          worksheetId: request.worksheetId ?? null,
          status: 'failed',
          error: String(error),
          messageId: null,
        },
        { transaction },
      ),
    )
  }
}
