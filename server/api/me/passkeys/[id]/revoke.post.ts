import { idParamsSchema } from '#shared/schemas/common'
import { revokePasskey } from '../../../../services/passkeys'

/** Revokes one of the user's passkeys: it signs nothing more, and still verifies what it signed. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return revokePasskey(user, id)
})
