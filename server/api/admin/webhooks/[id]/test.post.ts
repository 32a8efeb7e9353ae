import { idParamsSchema } from '#shared/schemas/common'
import { sendTestMessage } from '../../../../services/webhooks'

/** Queues a test message to this endpoint, signed and retried like any event. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'integration.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  setResponseStatus(event, 202)
  return sendTestMessage(admin, id)
})
