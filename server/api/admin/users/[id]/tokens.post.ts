import { apiTokenCreateSchema } from '#shared/schemas/api-token'
import { idParamsSchema } from '#shared/schemas/common'
import { issueToken } from '../../../../services/api-tokens'

/** A service token: an administrator issues a token for a system's account; the answer holds it once. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(apiTokenCreateSchema))
  setResponseStatus(event, 201)
  setResponseHeader(event, 'cache-control', 'no-store')
  return issueToken(admin, id, body)
})
