import { userPasskeyParamsSchema } from '#shared/schemas/common'
import { revokePasskey } from '../../../../../../services/passkeys'

/** An administrator revokes a user's passkey (a lost or left security key), audited. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id, passkeyId } = await getValidatedRouterParams(event, validateWith(userPasskeyParamsSchema))
  return revokePasskey(admin, passkeyId, id)
})
