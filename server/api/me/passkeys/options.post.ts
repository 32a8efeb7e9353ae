import { registrationOptions } from '../../../services/passkeys'

/** Starts registering a passkey: options for the browser and a ticket sealed for five minutes. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  setResponseHeader(event, 'cache-control', 'no-store')
  return registrationOptions(event, user)
})
