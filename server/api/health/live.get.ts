import { noQuerySchema } from '#shared/schemas/common'
import { ENGINE_VERSION } from '#shared/gas/version'

/** Up: the process answers (for a supervisor's liveness probe; says nothing of the database). Open to anyone. */
export default defineEventHandler(async (event) => {
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return { status: 'up', engineVersion: ENGINE_VERSION, uptimeSeconds: Math.round(process.uptime()) }
})
