import { idParamsSchema } from '#shared/schemas/common'
import { changeAuthorisation } from '../../../../services/authorisations'

/** Lifts a suspension (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return changeAuthorisation(admin, id, { reinstate: true })
})
