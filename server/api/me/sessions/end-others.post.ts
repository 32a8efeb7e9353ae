import { endOtherSessions } from '../../../services/sessions'

/** "Sign out everywhere else": every session of the user but this one ends. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  await endOtherSessions(user, event.context.sessionId)
  return { ended: true }
})
