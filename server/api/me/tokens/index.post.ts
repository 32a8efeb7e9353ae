import { apiTokenCreateSchema } from '#shared/schemas/api-token'
import { issueToken } from '../../../services/api-tokens'

/** Issues a personal API token: the answer holds it once; only its hash is kept. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const body = await readValidatedBody(event, validateWith(apiTokenCreateSchema))
  setResponseStatus(event, 201)
  setResponseHeader(event, 'cache-control', 'no-store')
  return issueToken(user, user.id, body)
})
