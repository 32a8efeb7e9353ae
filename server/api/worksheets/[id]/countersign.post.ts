import { idParamsSchema } from '../../../../shared/schemas/auth'
import { signatureSchema } from '../../../../shared/schemas/worksheet'
import { countersignWorksheet } from '../../../services/worksheets'

/** Independent inspection: an inspector who did not do the work countersigns, and the record is released. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  await countersignWorksheet(user, id, password, expectedVersion(event))
  return worksheetAnswer(event, id)
})
