import { webhookCreateSchema } from '#shared/schemas/webhook'
import { registerEndpoint } from '../../../services/webhooks'

/** Registers an endpoint for some events; the answer holds its signing secret, this once. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'integration.manage')
  const body = await readValidatedBody(event, validateWith(webhookCreateSchema))
  setResponseStatus(event, 201)
  setResponseHeader(event, 'cache-control', 'no-store')
  return registerEndpoint(admin, body)
})
