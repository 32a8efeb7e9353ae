import { idParamsSchema } from '#shared/schemas/common'
import { signingOptionsQuerySchema } from '#shared/schemas/signing'
import { signingOptions } from '../../../services/worksheets'

/** How this signature may be made, and a passkey's request options over exactly what would be signed now. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'worksheet.sign')
  const { capacity } = await getValidatedQuery(event, validateWith(signingOptionsQuerySchema))
  const user = await requireAbility(event, capacity === 'performer' ? 'worksheet.perform' : 'worksheet.inspect')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  setResponseHeader(event, 'cache-control', 'no-store')
  return signingOptions(event, user, id, capacity)
})
