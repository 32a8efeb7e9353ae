import { idParamsSchema } from '#shared/schemas/common'
import { signatureSchema } from '#shared/schemas/worksheet'
import { countersignWorksheet, versioned } from '../../../services/worksheets'

/** Independent inspection: an inspector who did not do the work countersigns; the record is released. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.inspect')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  return versioned(event, await countersignWorksheet(user, id, { event, password }, expectedVersion(event)))
})
