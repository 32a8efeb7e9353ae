import { listTokens } from '../../../services/api-tokens'

/** Every API token, personal and for systems' accounts, with its holder and last use. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'user.manage')
  return listTokens()
})
