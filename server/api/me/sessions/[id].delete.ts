import { idParamsSchema } from '#shared/schemas/common'
import { endOwnSession } from '../../../services/sessions'

/** Ends one of the user's own sessions (a device left signed in); ending this one signs out here. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  await endOwnSession(event, user, id)
  return { ended: true }
})
