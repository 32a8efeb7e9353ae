import { authorisationUpdateSchema } from '#shared/schemas/authorisation'
import { idParamsSchema } from '#shared/schemas/common'
import { changeAuthorisation } from '../../../services/authorisations'

/** Changes an authorisation's terms: scope, privileges, expiry (a renewal), issuing body (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const terms = await readValidatedBody(event, validateWith(authorisationUpdateSchema))
  return changeAuthorisation(admin, id, { terms })
})
