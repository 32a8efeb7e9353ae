import pino from 'pino'

/**
 * Structured logs: one JSON object a line on standard output (pino), for the log collector the organisation
 * runs. Every request's line carries its id (`reqId`, the x-request-id it came with or one given to it), the
 * same id its audit entries keep. NUXT_LOG_LEVEL (or LOG_LEVEL) sets the level: info by default.
 */
export const logger = pino({
  level: process.env.NUXT_LOG_LEVEL ?? process.env.LOG_LEVEL ?? 'info',
  base: { service: 'chargewell' },
  timestamp: pino.stdTimeFunctions.isoTime,
  formatters: { level: label => ({ level: label }) },
})
