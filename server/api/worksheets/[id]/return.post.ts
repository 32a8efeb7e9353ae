import { idParamsSchema } from '#shared/schemas/common'
import { reasonSchema } from '#shared/schemas/worksheet'
import { returnWorksheet, versioned } from '../../../services/worksheets'

/** Returns a worksheet to its performer with a reason; it keeps its history and can be corrected and signed again. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.inspect')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  return versioned(event, await returnWorksheet(user, id, reason, expectedVersion(event)))
})
