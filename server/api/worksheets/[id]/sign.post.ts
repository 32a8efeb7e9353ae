import { idParamsSchema } from '#shared/schemas/common'
import { signatureSchema } from '#shared/schemas/worksheet'
import { signWorksheet, versioned } from '../../../services/worksheets'

/** The performer signs (password re-entered): results are recomputed and frozen, and inspectors are told. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  return versioned(event, await signWorksheet(user, id, { event, password }, expectedVersion(event)))
})
