import { passkeyRegistrationSchema } from '#shared/schemas/signing'
import { registerPasskey } from '../../../services/passkeys'

/** Registers the passkey the browser created (its public key goes into the register, audited). */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const body = await readValidatedBody(event, validateWith(passkeyRegistrationSchema))
  setResponseStatus(event, 201)
  return registerPasskey(event, user, body as never)
})
