import { healthReport } from '../../services/health'

/**
 * Liveness, the database (answering, and taking writes), and how long the event loop has been held
 * up; the only route open without a session. 503 while the server is starting (server/utils/readiness.ts)
 * and while the database cannot take writes.
 */
export default defineEventHandler(async (event) => {
  const { healthy, report } = await healthReport()
  if (!healthy) setResponseStatus(event, 503)
  return report
})
