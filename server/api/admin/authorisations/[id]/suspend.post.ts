import { idParamsSchema } from '#shared/schemas/common'
import { suspensionSchema } from '#shared/schemas/authorisation'
import { changeAuthorisation } from '../../../../services/authorisations'

/** Suspends an authorisation with the reason: signatures under it are refused from this write on. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(suspensionSchema))
  return changeAuthorisation(admin, id, { suspend: reason })
})
