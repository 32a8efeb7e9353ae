import { idParamsSchema } from '#shared/schemas/common'
import { reasonSchema } from '#shared/schemas/worksheet'
import { voidWorksheet, versioned } from '../../../services/worksheets'

/** Voids a worksheet with a reason. The record stays, readable, marked voided. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.void')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  return versioned(event, await voidWorksheet(user, id, reason, expectedVersion(event)))
})
