import { createHmac, randomBytes } from 'node:crypto'
import { literal, Op, type Transaction } from 'sequelize'
import type { WebhookCreateBody, WebhookUpdateBody } from '#shared/schemas/webhook'
import type {
  SubscribableEvent,
  WebhookDeliveryDto,
  WebhookEndpointDto,
  WebhookEventType,
} from '#shared/types/webhook'
import { appendAudit } from '../database/audit-chain'
import { outsideTransaction } from '../database/write-queue'
import { Tool, WebhookAttempt, WebhookDelivery, WebhookEndpoint, type User, type Worksheet } from '../models'
import { retryBackoffMs } from '../utils/backoff'
import { notFound } from './audited-writes'
import type { AlertChange } from './unit-trends'

/**
 * Signed webhooks from a durable outbox. An event is announced inside the write that causes it: one
 * delivery row per endpoint that takes the event, committed with the record or not at all. A background
 * worker sends what is due — each delivery claimed by compare-and-set, so two servers never send it at
 * once — signed as the Standard Webhooks specification says, and retries a failure with exponential
 * backoff until it is given up (`failed`, for an administrator to replay). Deliveries about one subject
 * (one worksheet, one unit's alert, one gauge) go to an endpoint in the order they were announced: a
 * later one waits while an earlier one is still being retried. A delivery left `sending` by a server
 * that died is queued again once no attempt could still be running; the receiver takes each message
 * once by its `webhook-id`, which stays the same on every attempt.
 */

const MAX_ATTEMPTS = 15
const BATCH = 50
const PARALLEL = 8
/** A boolean in raw SQL, the same on SQLite (1) and PostgreSQL (true). */
const TRUE = 'true'

function settings() {
  const config = useRuntimeConfig()
  return {
    retryMs: Number(config.webhookRetrySeconds) * 1000 || 30_000,
    timeoutMs: Number(config.webhookTimeoutSeconds) * 1000 || 10_000,
  }
}

/** `v1,` + the base64 HMAC-SHA256 of `id.timestamp.body`, the key being the secret after its `whsec_` prefix. */
export function signMessage(secret: string, messageId: string, timestamp: number, body: string): string {
  const key = Buffer.from(secret.replace(/^whsec_/, ''), 'base64')
  return `v1,${createHmac('sha256', key).update(`${messageId}.${timestamp}.${body}`).digest('base64')}`
}

const messageIdFor = () => `msg_${randomBytes(16).toString('base64url')}`

// --- Endpoints -------------------------------------------------------------------------------------------

async function endpointDtos(where: { id?: number } = {}): Promise<WebhookEndpointDto[]> {
  const endpoints = await WebhookEndpoint.findAll({ where, order: [['id', 'ASC']] })
  const counts = await WebhookDelivery.findAll({
    attributes: ['endpointId', 'status', [WebhookDelivery.sequelize!.fn('count', '*'), 'n']],
    where: { status: { [Op.in]: ['queued', 'sending', 'failed'] } },
    group: ['endpointId', 'status'],
    raw: true,
  }) as unknown as { endpointId: number, status: string, n: number }[]
  const last = await WebhookDelivery.findAll({
    attributes: ['endpointId', [WebhookDelivery.sequelize!.fn('max', WebhookDelivery.sequelize!.col('delivered_at')), 'at']],
    group: ['endpointId'],
    raw: true,
  }) as unknown as { endpointId: number, at: string | Date | null }[]
  const count = (id: number, statuses: string[]) =>
    counts
      .filter(row => row.endpointId === id && statuses.includes(row.status))
      .reduce((sum, row) => sum + Number(row.n), 0)
  return endpoints.map((endpoint) => {
    const at = last.find(row => row.endpointId === endpoint.id)?.at
    return {
      id: endpoint.id,
      url: endpoint.url,
      description: endpoint.description,
      events: endpoint.events as SubscribableEvent[],
      active: endpoint.active,
      createdAt: endpoint.createdAt.toISOString(),
      waiting: count(endpoint.id, ['queued', 'sending']),
      failed: count(endpoint.id, ['failed']),
      lastDeliveredAt: at ? new Date(at).toISOString() : null,
    }
  })
}

export const listEndpoints = () => endpointDtos()

async function endpointById(id: number): Promise<WebhookEndpointDto> {
  const [found] = await endpointDtos({ id })
  return found ?? notFound('Webhook endpoint')
}

/** Registers an endpoint; the answer holds its signing secret, shown this once. */
export async function registerEndpoint(actor: Pick<User, 'id'>, body: WebhookCreateBody): Promise<WebhookEndpointDto & { secret: string }> {
  const secret = `whsec_${randomBytes(24).toString('base64')}`
  const created = await writeTransaction(async (transaction) => {
    const row = await WebhookEndpoint.create({ ...body, secret, createdById: actor.id }, { transaction })
    await appendAudit({
      actorId: actor.id,
      entity: 'webhook',
      entityId: String(row.id),
      action: 'registered',
      detail: { url: body.url, description: body.description, events: body.events },
    }, transaction)
    return row
  })
  // It hears at once of the gauges already falling due, as the others did.
  if (body.events.includes('gauge.calibration-due')) await announceCalibrationsDue()
  return { ...(await endpointById(created.id)), secret }
}

export async function updateEndpoint(actor: Pick<User, 'id'>, id: number, body: WebhookUpdateBody): Promise<WebhookEndpointDto> {
  await writeTransaction(async (transaction) => {
    const row = await WebhookEndpoint.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row) notFound('Webhook endpoint')
    const from = Object.fromEntries(Object.keys(body).map(key => [key, row.get(key)]))
    await row.update(body, { transaction })
    await appendAudit({ actorId: actor.id, entity: 'webhook', entityId: String(id), action: 'changed', detail: { from, to: body } }, transaction)
  })
  if (body.events?.includes('gauge.calibration-due')) await announceCalibrationsDue()
  // Resumed: what waited while it was paused goes now.
  if (body.active) void kickWebhooks()
  return endpointById(id)
}

// --- Announcing events -----------------------------------------------------------------------------------

interface Announcement {
  type: WebhookEventType
  subject: string
  data: Record<string, unknown>
  /** A message id that names the event itself, so announcing it again adds nothing (a gauge found due hourly). */
  messageId?: string
  /** Only to this endpoint (a test message), whatever it subscribes to. */
  endpointId?: number
}

/**
 * Queues the event for every endpoint that takes it, in the caller's write (or its own): the
 * deliveries commit with the record, or neither does. Sent in the background after the commit.
 */
export async function announce(announcements: Announcement[]): Promise<number> {
  if (announcements.length === 0) return 0
  return writeTransaction(async (transaction) => {
    // A paused endpoint (active: false) has its events queued too: they go when it is resumed.
    const endpoints = await WebhookEndpoint.findAll({ transaction })
    const now = new Date()
    const rows = announcements.flatMap((announcement) => {
      const messageId = announcement.messageId ?? messageIdFor()
      const payload = JSON.stringify({ type: announcement.type, timestamp: now.toISOString(), data: announcement.data })
      return endpoints
        .filter(endpoint => announcement.endpointId === undefined
          ? endpoint.events.includes(announcement.type)
          : endpoint.id === announcement.endpointId)
        .map(endpoint => ({
          endpointId: endpoint.id,
          eventType: announcement.type,
          messageId,
          subject: announcement.subject,
          payload,
          status: 'queued' as const,
          nextAttemptAt: now,
        }))
    })
    if (rows.length === 0) return 0
    // A message already queued for an endpoint (same id) is kept once: the unique index decides.
    await WebhookDelivery.bulkCreate(rows, { transaction, ignoreDuplicates: true })
    afterCommitKick(transaction)
    return rows.length
  })
}

function afterCommitKick(transaction: Transaction): void {
  // Not awaited, and outside this write: Sequelize awaits after-commit hooks before the write's turn ends.
  transaction.afterCommit(() => outsideTransaction(() => void setImmediate(() => void kickWebhooks())))
}

const RECORD_EVENTS = {
  released: 'record.released',
  returned: 'record.returned',
  voided: 'record.voided',
  corrected: 'record.corrected',
} as const

/** A worksheet's change of state, for the systems that follow records: in the write that made it. */
export async function announceRecord(
  change: keyof typeof RECORD_EVENTS,
  worksheet: Worksheet,
  detail: { reason?: string, correctedId?: number } = {},
): Promise<void> {
  const data = {
    worksheetId: worksheet.id,
    state: change === 'corrected' ? 'released' : change,
    workOrder: worksheet.workOrder,
    aircraft: { registration: worksheet.registration, fleetNumber: worksheet.fleetNumber },
    accumulator: {
      id: worksheet.accumulatorId,
      partNumber: worksheet.partNumber,
      serialNumber: worksheet.serialNumber,
      position: worksheet.position,
    },
    round: worksheet.round,
    serviceable: worksheet.serviceable,
    engineVersion: worksheet.engineVersion,
    ...(worksheet.correctsId ? { correctsId: worksheet.correctsId } : {}),
    ...detail,
    links: { record: `${publicAddress()}/worksheets/${worksheet.id}`, api: `/api/worksheets/${worksheet.id}` },
  }
  // A correction is about the record it replaces too: ordered with that record's own events.
  const subject = `worksheet:${change === 'corrected' ? detail.correctedId : worksheet.id}`
  await announce([{ type: RECORD_EVENTS[change], subject, data }])
}

/** Alerts newly raised on the trends (pre-charge loss, pump cycles, a record's integrity). */
export async function announceAlerts(changes: AlertChange[]): Promise<void> {
  await announce(changes.map(change => ({
    type: 'trend.alert-raised' as const,
    subject: `alert:${change.subject}`.slice(0, 80),
    data: { kind: change.kind, subject: change.subject, message: change.message, links: { trends: `${publicAddress()}/trends` } },
  })))
}

const DUE_WITHIN_DAYS = 30

/**
 * Gauges and carts whose calibration falls due within 30 days, or is past: announced once per tool and
 * due date (the message id names both), so the hourly check adds nothing it already queued.
 */
export async function announceCalibrationsDue(today = new Date()): Promise<number> {
  const horizon = new Date(today.getTime() + DUE_WITHIN_DAYS * 86_400_000).toISOString().slice(0, 10)
  const tools = await Tool.findAll({ where: { active: true, calibrationDue: { [Op.ne]: null, [Op.lte]: horizon } }, order: [['id', 'ASC']] })
  const day = today.toISOString().slice(0, 10)
  return announce(tools.map(tool => ({
    type: 'gauge.calibration-due' as const,
    subject: `tool:${tool.id}`,
    messageId: `msg_calibration-due_${tool.id}_${tool.calibrationDue}`,
    data: {
      toolId: tool.id,
      kind: tool.kind,
      assetNumber: tool.assetNumber,
      description: tool.description,
      calibrationDue: tool.calibrationDue,
      overdue: tool.calibrationDue! < day,
      links: { tool: `${publicAddress()}/tools/${tool.id}` },
    },
  })))
}

/** A test message to one endpoint, through the same outbox, signature and retries as any event. */
export async function sendTestMessage(actor: Pick<User, 'id' | 'name'>, endpointId: number): Promise<WebhookDeliveryDto> {
  await endpointById(endpointId)
  const messageId = messageIdFor()
  await announce([{
    type: 'webhook.test',
    subject: `test:${endpointId}`,
    messageId,
    endpointId,
    data: { message: `A test message sent by ${actor.name} from Chargewell's Admin → Webhooks.` },
  }])
  const delivery = await WebhookDelivery.findOne({ where: { endpointId, messageId }, include: [{ model: WebhookAttempt, as: 'history' }] })
  return toDeliveryDto(delivery!)
}

// --- Deliveries --------------------------------------------------------------------------------------------

function toDeliveryDto(delivery: WebhookDelivery): WebhookDeliveryDto {
  return {
    id: delivery.id,
    endpointId: delivery.endpointId,
    eventType: delivery.eventType,
    messageId: delivery.messageId,
    subject: delivery.subject,
    status: delivery.status,
    attempts: delivery.attempts,
    nextAttemptAt: delivery.nextAttemptAt?.toISOString() ?? null,
    lastAttemptAt: delivery.lastAttemptAt?.toISOString() ?? null,
    deliveredAt: delivery.deliveredAt?.toISOString() ?? null,
    createdAt: delivery.createdAt.toISOString(),
    payload: delivery.payload,
    history: [...(delivery.history ?? [])]
      .sort((a, b) => a.id - b.id)
      .map(attempt => ({
        attemptedAt: attempt.attemptedAt.toISOString(),
        statusCode: attempt.statusCode,
        error: attempt.error,
        durationMs: attempt.durationMs,
      })),
  }
}

/** An endpoint's deliveries, newest first, each with every attempt. */
export async function deliveriesOf(
  endpointId: number,
  query: { status?: WebhookDeliveryDto['status'], limit: number },
): Promise<WebhookDeliveryDto[]> {
  await endpointById(endpointId)
  const rows = await WebhookDelivery.findAll({
    where: { endpointId, ...(query.status ? { status: query.status } : {}) },
    include: [{ model: WebhookAttempt, as: 'history' }],
    order: [['id', 'DESC']],
    limit: query.limit,
  })
  return rows.map(toDeliveryDto)
}

/** Sends a delivery again (delivered or given up): same message id, attempts counted on; audited. */
export async function replayDelivery(actor: Pick<User, 'id'>, id: number): Promise<WebhookDeliveryDto> {
  await writeTransaction(async (transaction) => {
    const delivery = await WebhookDelivery.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!delivery) notFound('Webhook delivery')
    if (delivery.status === 'queued' || delivery.status === 'sending') {
      throw createError({ status: 409, statusMessage: 'Conflict', message: 'This delivery is already waiting to be sent; it needs no replay.' })
    }
    await delivery.update({ status: 'queued', nextAttemptAt: new Date(), deliveredAt: null }, { transaction })
    await appendAudit({
      actorId: actor.id,
      entity: 'webhook',
      entityId: String(delivery.endpointId),
      action: 'replayed',
      detail: { deliveryId: id, messageId: delivery.messageId, eventType: delivery.eventType },
    }, transaction)
    afterCommitKick(transaction)
  })
  const row = await WebhookDelivery.findByPk(id, { include: [{ model: WebhookAttempt, as: 'history' }] })
  return toDeliveryDto(row!)
}

/** Deliveries waiting (queued or being sent) and given up, for the health report and metrics. */
export async function webhookBacklog(): Promise<{ waiting: number, failed: number }> {
  const [waiting, failed] = await Promise.all([
    WebhookDelivery.count({ where: { status: { [Op.in]: ['queued', 'sending'] } } }),
    WebhookDelivery.count({ where: { status: 'failed' } }),
  ])
  return { waiting, failed }
}

// --- The worker --------------------------------------------------------------------------------------------

async function attempt(delivery: WebhookDelivery, endpoint: WebhookEndpoint): Promise<void> {
  const attempts = delivery.attempts + 1
  const startedAt = new Date()
  const [claimed] = await writeTransaction(transaction => WebhookDelivery.update(
    { status: 'sending', attempts, lastAttemptAt: startedAt },
    { where: { id: delivery.id, status: 'queued' }, transaction },
  ))
  if (!claimed) return
  const { timeoutMs } = settings()
  const timestamp = Math.floor(Date.now() / 1000)
  let statusCode: number | null = null
  let error: string | null = null
  try {
    const response = await fetch(endpoint.url, {
      method: 'POST',
      redirect: 'manual',
      signal: AbortSignal.timeout(timeoutMs),
      headers: {
        'content-type': 'application/json',
        'user-agent': 'Chargewell-Webhooks/1',
        'webhook-id': delivery.messageId,
        'webhook-timestamp': String(timestamp),
        'webhook-signature': signMessage(endpoint.secret, delivery.messageId, timestamp, delivery.payload),
      },
      body: delivery.payload,
    })
    statusCode = response.status
    const text = await response.text().catch(() => '')
    if (!response.ok) error = `Answered ${response.status}${text ? `: ${text.slice(0, 300)}` : ''}`
  }
  catch (failure) {
    const cause = (failure as { cause?: { code?: string } }).cause?.code
    error = (failure as Error).name === 'TimeoutError'
      ? `No answer within ${timeoutMs / 1000} s`
      : `Could not reach the endpoint${cause ? ` (${cause})` : ''}: ${(failure as Error).message}`
  }
  const finishedAt = new Date()
  const givingUp = error !== null && attempts >= MAX_ATTEMPTS
  const outcome: Partial<WebhookDelivery> = error === null
    ? { status: 'delivered', deliveredAt: finishedAt, nextAttemptAt: null }
    : givingUp
      ? { status: 'failed', nextAttemptAt: null }
      : { status: 'queued', nextAttemptAt: new Date(finishedAt.getTime() + retryBackoffMs(attempts, settings().retryMs)) }
  if (error) console.error(`Webhook ${delivery.messageId} to ${endpoint.url} failed (attempt ${attempts}${givingUp ? ', giving up' : ''}): ${error}`)
  await writeTransaction(async (transaction) => {
    await WebhookAttempt.create({
      deliveryId: delivery.id,
      attemptedAt: startedAt,
      statusCode,
      error,
      durationMs: finishedAt.getTime() - startedAt.getTime(),
    }, { transaction })
    await WebhookDelivery.update(outcome, { where: { id: delivery.id, status: 'sending' }, transaction })
  })
}

/**
 * The deliveries that may go now: due, to an active endpoint, and each the earliest unfinished one of its
 * endpoint and subject (a later event about a record never overtakes an earlier one being retried).
 */
function sendable(now: Date): Promise<WebhookDelivery[]> {
  return WebhookDelivery.findAll({
    where: {
      status: 'queued',
      nextAttemptAt: { [Op.lte]: now },
      [Op.and]: [
        literal(`"WebhookDelivery"."endpoint_id" IN (SELECT "id" FROM "webhook_endpoints" WHERE "active" = ${TRUE})`),
        literal(`NOT EXISTS (SELECT 1 FROM "webhook_deliveries" AS "earlier"
          WHERE "earlier"."endpoint_id" = "WebhookDelivery"."endpoint_id" AND "earlier"."subject" = "WebhookDelivery"."subject"
          AND "earlier"."id" < "WebhookDelivery"."id" AND "earlier"."status" IN ('queued', 'sending'))`),
      ],
    },
    include: [{ model: WebhookEndpoint, as: 'endpoint' }],
    order: [['id', 'ASC']],
    limit: BATCH,
  })
}

let working: Promise<void> | null = null
let again = false

/** Sends what is due now; called after an event is queued, and by the worker's timer. */
export function kickWebhooks(): Promise<void> {
  if (working) {
    again = true
    return working
  }
  working = (async () => {
    try {
      do {
        again = false
        const now = new Date()
        // A delivery a dead server was sending: no attempt runs longer than the timeout, so it is queued again.
        const staleBefore = new Date(now.getTime() - 2 * settings().timeoutMs - 5_000)
        await writeTransaction(transaction => WebhookDelivery.update(
          { status: 'queued', nextAttemptAt: now },
          { where: { status: 'sending', lastAttemptAt: { [Op.lt]: staleBefore } }, transaction },
        ))
        // An endpoint switched off keeps its deliveries queued until it is switched on again.
        const ready = await sendable(now)
        if (ready.length === 0) break
        // A few at a time; each subject's deliveries one after another (only its earliest was chosen).
        for (let start = 0; start < ready.length; start += PARALLEL) {
          await Promise.all(ready.slice(start, start + PARALLEL).map(delivery => attempt(delivery, delivery.endpoint!)))
        }
        // What was delivered lets the next event of its subject go.
        again = true
      } while (again)
    }
    catch (error) {
      console.error('The webhook outbox could not be worked through:', error)
    }
    finally {
      working = null
    }
  })()
  return working
}
