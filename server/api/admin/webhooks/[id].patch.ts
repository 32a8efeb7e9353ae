import { idParamsSchema } from '#shared/schemas/common'
import { webhookUpdateSchema } from '#shared/schemas/webhook'
import { updateEndpoint } from '../../../services/webhooks'

/** Changes an endpoint's description or events, or switches it off (its deliveries wait) and on. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'integration.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(webhookUpdateSchema))
  return updateEndpoint(admin, id, body)
})
