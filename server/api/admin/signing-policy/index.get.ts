import { signingPolicy } from '../../../services/signing-policy'

/** How each role signs. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'user.manage')
  return signingPolicy()
})
