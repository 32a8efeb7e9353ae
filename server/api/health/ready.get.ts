import { noQuerySchema } from '#shared/schemas/common'
import { readinessReport } from '../../services/health'

/**
 * Ready: started, migrations done, the database reachable and taking writes, secrets present — each check in
 * words; 503 while any fails (for a load balancer's readiness probe). Open to anyone.
 */
export default defineEventHandler(async (event) => {
  await getValidatedQuery(event, validateWith(noQuerySchema))
  const { ready, checks } = await readinessReport()
  if (!ready) setResponseStatus(event, 503)
  return { status: ready ? 'ready' : 'not ready', checks }
})
