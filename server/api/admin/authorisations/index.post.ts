import { authorisationCreateSchema } from '#shared/schemas/authorisation'
import { createAuthorisation } from '../../../services/authorisations'

/** Records a certifying authorisation in the register (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const body = await readValidatedBody(event, validateWith(authorisationCreateSchema))
  setResponseStatus(event, 201)
  return createAuthorisation(admin, body)
})
