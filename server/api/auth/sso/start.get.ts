import { ssoStartQuerySchema } from '#shared/schemas/auth'
import { startSsoSignIn } from '../../../services/single-sign-on'

/** Sends the browser to the organisation's identity provider to sign in (code flow with PKCE). Open to anyone. */
export default defineEventHandler(async (event) => {
  const { next } = await getValidatedQuery(event, validateWith(ssoStartQuerySchema))
  return sendRedirect(event, await startSsoSignIn(event, next), 302)
})
