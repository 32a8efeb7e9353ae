/**
 * What another system can hear of, by webhook. Each message is a JSON body `{ type, timestamp, data }`
 * sent with the headers of the Standard Webhooks specification (standardwebhooks.com): `webhook-id`
 * (the same on every retry and replay: take each once), `webhook-timestamp` (Unix seconds) and
 * `webhook-signature` (`v1,` + base64 HMAC-SHA256 of `id.timestamp.body` under the endpoint's secret).
 */
export const WEBHOOK_EVENTS = {
  'record.released': 'A worksheet was countersigned and released.',
  'record.returned': 'An inspector returned a worksheet to its performer, with the reason.',
  'record.voided': 'A worksheet was voided, with the reason.',
  'record.corrected': 'A released correction replaced an earlier record.',
  'trend.alert-raised': 'A unit\'s pre-charge loss or a system\'s pump cycles crossed its threshold.',
  'gauge.calibration-due': 'A gauge or cart falls due for calibration within 30 days (or is overdue).',
} as const

export type WebhookEventType = keyof typeof WEBHOOK_EVENTS | 'webhook.test'
export type SubscribableEvent = keyof typeof WEBHOOK_EVENTS
export const SUBSCRIBABLE_EVENTS = Object.keys(WEBHOOK_EVENTS) as [SubscribableEvent, ...SubscribableEvent[]]

/** queued (waiting for its next try), sending, delivered (answered 2xx), or failed (given up after every retry). */
export type WebhookDeliveryStatus = 'queued' | 'sending' | 'delivered' | 'failed'

export interface WebhookEndpointDto {
  id: number
  url: string
  description: string
  events: SubscribableEvent[]
  active: boolean
  createdAt: string
  /** Deliveries waiting (queued or being sent) and given up, for the list. */
  waiting: number
  failed: number
  lastDeliveredAt: string | null
}

export interface WebhookAttemptDto {
  attemptedAt: string
  statusCode: number | null
  error: string | null
  durationMs: number
}

export interface WebhookDeliveryDto {
  id: number
  endpointId: number
  eventType: WebhookEventType
  messageId: string
  subject: string
  status: WebhookDeliveryStatus
  attempts: number
  nextAttemptAt: string | null
  lastAttemptAt: string | null
  deliveredAt: string | null
  createdAt: string
  payload: string
  history: WebhookAttemptDto[]
}
