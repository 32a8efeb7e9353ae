import { Op } from 'sequelize'
import { loginSchema } from '../../../shared/schemas/auth'
import { LoginAttempt, User } from '../../models'

const LOCKOUT_FAILURES = 5
const LOCKOUT_WINDOW_MS = 15 * 60_000
const WRONG_CREDENTIALS = 'That e-mail address and password do not match an active account.'

/** Sign-in: open to anyone, so it validates first; 5 failures in 15 minutes lock the account for the rest of the window. */
export default defineEventHandler(async (event) => {
  const { email, password } = await readValidatedBody(event, validateWith(loginSchema))
  const now = Date.now()
  const lastSuccess = await LoginAttempt.max<Date, LoginAttempt>('at', { where: { email, succeeded: true } })
  const since = new Date(Math.max(now - LOCKOUT_WINDOW_MS, lastSuccess ? new Date(lastSuccess).getTime() + 1 : 0))
  const failures = await LoginAttempt.findAll({ where: { email, succeeded: false, at: { [Op.gte]: since } }, order: [['at', 'DESC']], limit: LOCKOUT_FAILURES })
  if (failures.length >= LOCKOUT_FAILURES) {
    const unlockAt = failures[LOCKOUT_FAILURES - 1]!.at.getTime() + LOCKOUT_WINDOW_MS
    const retryAfterSeconds = Math.max(1, Math.ceil((unlockAt - now) / 1000))
    setResponseHeader(event, 'Retry-After', retryAfterSeconds)
    throw createError({
      status: 429,
      message: `Too many failed sign-ins for this account. Try again in ${Math.ceil(retryAfterSeconds / 60)} minute(s).`,
      data: { retryAfterSeconds },
    })
  }

  const user = await User.findOne({ where: { email } })
  const passwordMatches = user ? await verifyPassword(user.passwordHash, password) : false
  await LoginAttempt.create({ email, succeeded: passwordMatches && !user!.disabled, at: new Date(now) })
  if (!user || !passwordMatches) throw createError({ status: 401, message: WRONG_CREDENTIALS })
  if (user.disabled) throw createError({ status: 401, message: 'This account is disabled. Ask an administrator to enable it.' })

  await setUserSession(event, { user: sessionUser(user), loggedInAt: new Date(now).toISOString() })
  return user.toPublic()
})
