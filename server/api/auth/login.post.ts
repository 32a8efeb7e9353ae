import { loginSchema } from '../../../shared/schemas/auth'
import { User } from '../../models'
import { beginSession } from '../../services/sessions'

const WRONG_CREDENTIALS = 'That e-mail address and password do not match an active account.'

/**
 * Sign-in: open to anyone, so it validates first. The attempt is counted and recorded before
 * the password is checked (see server/utils/sign-in.ts): 5 failures in 15 minutes lock the
 * account, and 30 lock the network address, for the rest of the window.
 */
export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, validateWith(loginSchema))
  const ticket = await admitAttempt(event, email)
  const user = await User.findOne({ where: { email } })
  const passwordMatches = await checkPassword(user?.passwordHash, password)
  if (!user || !passwordMatches) throw createError({ status: 401, statusMessage: 'Unauthorized', message: WRONG_CREDENTIALS })
  if (user.disabled) throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'This account is disabled. Ask an administrator to enable it.' })
  await attemptSucceeded(ticket)
  await beginSession(event, user)
  return user.toPublic()
})
