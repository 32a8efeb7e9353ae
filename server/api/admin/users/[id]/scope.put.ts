import { idParamsSchema } from '#shared/schemas/common'
import { userScopeSchema } from '#shared/schemas/organisation'
import { setUserScope } from '../../../../services/organisation'

/** Grants a user stations and operators (null: every one); audited, and their next request sees it. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(userScopeSchema))
  return (await setUserScope(admin, id, body)).toPublic()
})
