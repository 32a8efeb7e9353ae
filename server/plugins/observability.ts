import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { setRequestIdSource } from '../database/audit-chain'
import { observeWriteWaits } from '../database/write-queue'
import { Notification } from '../models'
import { webhookBacklog } from '../services/webhooks'
import { logger } from '../utils/logger'
import { gaugeOnScrape, httpDuration, httpRequests, syncsInFlight, writeQueueWait } from '../utils/metrics'

const REQUEST_ID = /^[\w.:-]{1,64}$/
const SYNC_ROUTE = '/api/worksheets/sync'

/**
 * What the server says of itself: each request gets an id (the x-request-id it came with, if it is a plain
 * token, or a new one), answered in the same header, logged as one JSON line (pino) and kept on every audit
 * entry it writes; each is counted and timed per route for /metrics, with the write queue's wait, the pool,
 * the outboxes' backlog, syncs in flight and the event loop's delay.
 */
export default defineNitroPlugin((nitroApp) => {
  setRequestIdSource(() => {
    try {
      return (useEvent().context.requestId as string | undefined) ?? null
    }
    catch {
      return null // not in a request (a start-up step, a background worker)
    }
  })
  observeWriteWaits(seconds => writeQueueWait.observe(seconds))

  gaugeOnScrape('chargewell_mail_outbox_messages', 'E-mails in the outbox, by status (queued, sending, failed).', async () => {
    const rows = await Notification.count({ where: { status: { [Op.in]: ['queued', 'sending', 'failed'] } }, group: ['status'] })
    return Object.fromEntries(['queued', 'sending', 'failed'].map(status => [status, rows.find(row => row.status === status)?.count ?? 0]))
  }, 'status')
  gaugeOnScrape('chargewell_webhook_deliveries', 'Webhook deliveries waiting (queued or being sent) and given up.', async () => {
    const { waiting, failed } = await webhookBacklog()
    return { waiting, failed }
  }, 'state')
  gaugeOnScrape('chargewell_database_pool_connections', 'Database connections in the pool, by state (size, available, using, waiting).', async () => {
    const pool = ((await useDB()).connectionManager as unknown as { pool?: Record<string, number> }).pool
    if (!pool) return {} as Record<string, number>
    return { size: pool.size ?? 0, available: pool.available ?? 0, using: pool.using ?? 0, waiting: pool.waiting ?? 0 }
  }, 'state')
  gaugeOnScrape('chargewell_event_loop_delay_ms', 'The longest event-loop delay in the current five-second window (ms).', async () =>
    eventLoopDelay()?.currentWindowMaxMs ?? 0)
  gaugeOnScrape('chargewell_write_queue_waiting', 'Writes waiting for their turn now.', async () =>
    writesWaiting())

  nitroApp.hooks.hook('request', (event) => {
    const given = getRequestHeader(event, 'x-request-id')
    const requestId = given && REQUEST_ID.test(given) ? given : randomUUID()
    event.context.requestId = requestId
    event.context.startedAt = performance.now()
    setResponseHeader(event, 'x-request-id', requestId)
    if (event.path === SYNC_ROUTE) syncsInFlight.inc()
  })

  nitroApp.hooks.hook('afterResponse', (event) => {
    const startedAt = event.context.startedAt as number | undefined
    if (startedAt === undefined) return
    if (event.path === SYNC_ROUTE) syncsInFlight.dec()
    const seconds = (performance.now() - startedAt) / 1000
    const path = event.path.split('?')[0]!
    const route = (event.context.matchedRoute?.path as string | undefined)
      ?? (path.startsWith('/api/') ? 'unmatched' : path.startsWith('/_nuxt/') ? 'assets' : 'page')
    const status = event.node.res.statusCode
    httpRequests.inc({ route, method: event.method, status: String(status) })
    httpDuration.observe({ route, method: event.method }, seconds)
    const line = {
      reqId: event.context.requestId,
      method: event.method,
      route,
      path,
      status,
      ms: Math.round(seconds * 10_000) / 10,
      userId: (event.context.userId as number | undefined) ?? undefined,
    }
    // 503 is said on purpose (starting, or the database not taking writes): a warning, not a failure of ours.
    if (status === 503) logger.warn(line, 'request refused: not ready')
    else if (status >= 500) logger.error(line, 'request failed')
    else logger.info(line, 'request')
  })

  nitroApp.hooks.hook('error', (error, { event }) => {
    const status = (error as { statusCode?: number }).statusCode ?? 500
    if (status >= 500) logger.error({ reqId: event?.context.requestId, err: error }, 'unhandled error')
  })
})
