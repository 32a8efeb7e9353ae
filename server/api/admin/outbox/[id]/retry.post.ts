import { idParamsSchema } from '#shared/schemas/common'
import { retryFailedMail } from '../../../../services/notifications'

/** Sends a message that was given up on again, its attempts counted afresh. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'outbox.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return retryFailedMail(id)
})
