import { noQuerySchema } from '#shared/schemas/common'
import { listEndpoints } from '../../../services/webhooks'

/** Every webhook endpoint, with the events it takes and its deliveries waiting and given up. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'integration.manage')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return listEndpoints()
})
