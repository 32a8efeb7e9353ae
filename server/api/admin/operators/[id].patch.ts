import { idParamsSchema } from '#shared/schemas/common'
import { operatorUpdateSchema } from '#shared/schemas/organisation'
import { updateOperator } from '../../../services/organisation'

/** Renames an operator or changes its code (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'fleet.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(operatorUpdateSchema))
  return updateOperator(admin, id, body)
})
