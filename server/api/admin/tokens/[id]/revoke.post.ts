import { idParamsSchema } from '#shared/schemas/common'
import { revokeToken } from '../../../../services/api-tokens'

/** Revokes any API token (a system retired, a token leaked). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return revokeToken(admin, id)
})
