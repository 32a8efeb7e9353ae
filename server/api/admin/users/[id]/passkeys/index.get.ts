import { idParamsSchema } from '#shared/schemas/common'
import { passkeysOf } from '../../../../../services/passkeys'

/** A user's passkey register: every key with its registration and revocation times. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return passkeysOf(id)
})
