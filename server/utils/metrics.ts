import client from 'prom-client'

/**
 * Prometheus metrics (prom-client), served at /metrics to a scraper holding NUXT_METRICS_TOKEN: requests and
 * their latency per route, the write queue's wait, the database pool, the mail outbox's and webhooks' backlog,
 * device syncs, and the event loop's delay (with Node's own process metrics).
 */
export const metricsRegistry = new client.Registry()
metricsRegistry.setDefaultLabels({ service: 'chargewell' })
client.collectDefaultMetrics({ register: metricsRegistry })

export const httpRequests = new client.Counter({
  name: 'chargewell_http_requests_total',
  help: 'Requests answered, by route pattern, method and status.',
  labelNames: ['route', 'method', 'status'] as const,
  registers: [metricsRegistry],
})

export const httpDuration = new client.Histogram({
  name: 'chargewell_http_request_duration_seconds',
  help: 'Time to answer, by route pattern and method.',
  labelNames: ['route', 'method'] as const,
  buckets: [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10],
  registers: [metricsRegistry],
})

export const writeQueueWait = new client.Histogram({
  name: 'chargewell_write_queue_wait_seconds',
  help: 'How long a write waited for its turn in the single-writer queue (0 on PostgreSQL, which locks rows).',
  buckets: [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5],
  registers: [metricsRegistry],
})

export const syncsInFlight = new client.Gauge({
  name: 'chargewell_device_sync_in_flight',
  help: 'Worksheets from devices being taken in now (POST /api/worksheets/sync).',
  registers: [metricsRegistry],
})

/** A gauge read when scraped. */
export function gaugeOnScrape(
  name: string,
  help: string,
  read: () => Promise<number | Record<string, number>>,
  labelName?: string,
) {
  return new client.Gauge({
    name,
    help,
    labelNames: labelName ? [labelName] : [],
    registers: [metricsRegistry],
    async collect() {
      const value = await read().catch(() => Number.NaN)
      if (typeof value === 'number') this.set(value)
      else for (const [label, count] of Object.entries(value)) this.set({ [labelName!]: label }, count)
    },
  })
}
