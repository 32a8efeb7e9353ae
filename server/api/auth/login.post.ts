import { loginSchema } from '#shared/schemas/auth'
import { signIn } from '../../services/sessions'

/**
 * Sign-in: open to anyone, so it validates first. The attempt is counted and recorded before the
 * password is checked: failures lock the account, and the network address, for the rest of the window.
 */
export default defineEventHandler(async (event) => {
  const body = await readValidatedBody(event, validateWith(loginSchema))
  return signIn(event, body)
})
