import { z } from 'zod'
import { revokePasskey } from '../../../../../../services/passkeys'

const paramsSchema = z.object({ id: z.coerce.number().int().positive(), passkeyId: z.coerce.number().int().positive() })

/** An administrator revokes a user's passkey (a lost or left security key), audited. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id, passkeyId } = await getValidatedRouterParams(event, validateWith(paramsSchema))
  return revokePasskey(admin, passkeyId, id)
})
