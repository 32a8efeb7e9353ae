import { idParamsSchema } from '#shared/schemas/common'
import { discardSchema } from '#shared/schemas/worksheet'
import { discardWorksheet, versioned } from '../../../services/worksheets'

/** The performer discards their own unsigned draft; it stays on record, voided, with the reason. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(discardSchema))
  return versioned(event, await discardWorksheet(user, id, reason, expectedVersion(event)))
})
