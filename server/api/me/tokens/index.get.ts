import { listTokens } from '../../../services/api-tokens'

/** The signed-in user's API tokens (never the tokens themselves: those are shown once, at issue). */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  return listTokens(user.id)
})
