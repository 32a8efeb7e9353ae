import { signingPolicySchema } from '#shared/schemas/signing'
import { setSigningPolicy } from '../../../services/signing-policy'

/** Chooses how each role signs: password, passkey, or either (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const policy = await readValidatedBody(event, validateWith(signingPolicySchema))
  return setSigningPolicy(admin, policy)
})
