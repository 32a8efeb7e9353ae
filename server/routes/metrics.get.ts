import { timingSafeEqual } from 'node:crypto'
import { metricsRegistry } from '../utils/metrics'

/**
 * Prometheus metrics (text exposition format) for a scraper that sends `Authorization: Bearer <NUXT_METRICS_TOKEN>`.
 * 404 while no token is configured; 401 without the right one.
 */
export default defineEventHandler(async (event) => {
  const token = String(useRuntimeConfig().metricsToken ?? '')
  if (!token) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Metrics are off: set NUXT_METRICS_TOKEN to turn them on.' })
  const given = Buffer.from((getRequestHeader(event, 'authorization') ?? '').replace(/^Bearer\s+/i, ''))
  const expected = Buffer.from(token)
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    setResponseHeader(event, 'www-authenticate', 'Bearer realm="metrics"')
    throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'Send the metrics token as Authorization: Bearer <token>.' })
  }
  setResponseHeader(event, 'content-type', metricsRegistry.contentType)
  setResponseHeader(event, 'cache-control', 'no-store')
  return metricsRegistry.metrics()
})
