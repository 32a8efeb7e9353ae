import { idParamsSchema } from '#shared/schemas/common'
import { replayDelivery } from '../../../../../services/webhooks'

/** Sends a delivered or given-up message again, with the same webhook-id; audited. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'integration.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return replayDelivery(admin, id)
})
