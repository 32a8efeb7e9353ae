import { noQuerySchema } from '#shared/schemas/common'
import { outbox } from '../../../services/notifications'

/** E-mails Chargewell sent (or failed to send), and, with the local fake SMTP server, what it received. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'outbox.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return outbox()
})
