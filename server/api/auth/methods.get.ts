import { noQuerySchema } from '#shared/schemas/common'
import { signInMethods } from '../../services/single-sign-on'

/** How one signs in here: with a password, through the organisation's identity provider, or both. Open to anyone. */
export default defineEventHandler(async (event) => {
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return signInMethods()
})
