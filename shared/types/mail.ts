/** The outbox an administrator reads (`GET /api/admin/outbox`). */
export interface OutboxDto {
  /** The local fake SMTP server is catching mail (development, tests, demo). */
  fakeSmtp: boolean
  notifications: {
    id: number
    recipient: string
    subject: string
    body: string
    kind: string
    /** queued (waiting for its next try), sending, sent, or failed (given up after every retry). */
    status: 'queued' | 'sending' | 'sent' | 'failed'
    error: string | null
    createdAt: string
    attempts: number
    nextAttemptAt: string | null
    lastAttemptAt: string | null
  }[]
  /** What the fake SMTP server received. */
  received: { receivedAt: string, to: string[], subject: string, text: string }[]
}
