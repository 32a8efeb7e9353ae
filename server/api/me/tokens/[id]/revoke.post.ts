import { idParamsSchema } from '#shared/schemas/common'
import { revokeToken } from '../../../../services/api-tokens'

/** Revokes one of one's own API tokens. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return revokeToken(user, id, user.id)
})
