import { idParamsSchema } from '../../../../shared/schemas/auth'
import { reasonSchema } from '../../../../shared/schemas/worksheet'
import { voidWorksheet } from '../../../services/worksheets'

/** Voids a worksheet with a reason (inspector or admin). The record stays, readable, marked voided. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector', 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  await voidWorksheet(user, id, reason, expectedVersion(event))
  return worksheetAnswer(event, id)
})
