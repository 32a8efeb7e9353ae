import { passkeysOf } from '../../../services/passkeys'

/** The signed-in user's passkeys, revoked ones included (they still verify what they signed). */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  return passkeysOf(user.id)
})
