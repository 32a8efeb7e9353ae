import { preferencesSchema } from '#shared/schemas/auth'
import { savePreferences } from '../../services/users'

/** Saves the user's display units and home station. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const preferences = await readValidatedBody(event, validateWith(preferencesSchema))
  return savePreferences(user, preferences)
})
