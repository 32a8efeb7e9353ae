import { noQuerySchema } from '#shared/schemas/common'
import { waitingWorkFor } from '../../services/home'

/** What waits for the signed-in user: their drafts and returned work, the countersign queue, alerts, tools due. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return waitingWorkFor(user)
})
