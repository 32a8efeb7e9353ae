import { ssoCallbackQuerySchema } from '#shared/schemas/auth'
import { finishSsoSignIn, SsoRefusal } from '../../../services/single-sign-on'

/**
 * Where the identity provider sends the browser back: the account is found (or refused, said on the sign-in
 * page), its roles and stations taken from the claims, and the user lands where they were going. Open to anyone.
 */
export default defineEventHandler(async (event) => {
  const query = await getValidatedQuery(event, validateWith(ssoCallbackQuerySchema))
  const refused = (message: string) => sendRedirect(event, `/login?${new URLSearchParams({ refused: message })}`, 302)
  if (query.error) return refused(`The identity provider did not sign you in: ${query.error_description ?? query.error}.`)
  try {
    return sendRedirect(event, await finishSsoSignIn(event), 302)
  }
  catch (error) {
    if (error instanceof SsoRefusal) return refused(error.message)
    throw error
  }
})
