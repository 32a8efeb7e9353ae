import { idParamsSchema } from '#shared/schemas/common'
import { webhookDeliveryQuerySchema } from '#shared/schemas/webhook'
import { deliveriesOf } from '../../../../services/webhooks'

/** An endpoint's deliveries, newest first: status, every attempt with its answer, the next try. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'integration.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const query = await getValidatedQuery(event, validateWith(webhookDeliveryQuerySchema))
  return deliveriesOf(id, query)
})
