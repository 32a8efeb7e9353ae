import { noQuerySchema } from '#shared/schemas/common'
import type { SessionDto } from '#shared/types/user'
import { devicesOf } from '../../../services/sessions'

/** The devices the user is signed in on, this one marked. */
export default defineEventHandler(async (event): Promise<SessionDto[]> => {
  const user = await requireAbility(event, 'account.own')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return devicesOf(user.id, event.context.sessionId)
})
