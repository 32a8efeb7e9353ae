import { z } from 'zod'
import { passkeysOf, revokePasskey } from '../../../../../../services/passkeys'

const paramsSchema = z.object({ id: z.coerce.number().int().positive(), passkeyId: z.coerce.number().int().positive() })

/** An administrator revokes a user's passkey (a lost or left security key), audited. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id, passkeyId } = await getValidatedRouterParams(event, validateWith(paramsSchema))
  const passkeys = await passkeysOf(id)
  if (!passkeys.some(passkey => passkey.id === passkeyId))
    throw createError({ status: 404, statusMessage: 'Not Found', message: 'That user has no such passkey.' })
  return revokePasskey(admin, passkeyId, { anyUser: true })
})
