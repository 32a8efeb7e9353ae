import type { H3Event } from 'h3'
import { User, UserSession } from '../models'
import {
  beginSession, endAllSessions, endSession, hasSessionCookie, liveSession, openSessions, SessionEnded,
} from '../utils/session-store'
import { passwordsSignIn, ssoSettings } from './single-sign-on'

const WRONG_CREDENTIALS = 'That e-mail address and password do not match an active account.'

/**
 * Signing in and out, re-authentication before a signature, and a user's own devices: the flows,
 * on the session store of server/utils/session-store.ts.
 */
/**
 * Signs in. The attempt is counted and recorded before the password is checked (server/utils/sign-in.ts):
 * failures lock the account, and the network address, for the rest of the window. An unknown
 * account costs the same work as a known one.
 */
export async function signIn(event: H3Event, body: { email: string, password: string }) {
  const ticket = await admitAttempt(event, body.email)
  const user = await User.findOne({ where: { email: body.email } })
  const passwordMatches = await checkPassword(user?.passwordHash, body.password)
  if (!user || !passwordMatches) throw createError({ status: 401, statusMessage: 'Unauthorized', message: WRONG_CREDENTIALS })
  if (user.disabled) throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'This account is disabled. Ask an administrator to enable it.' })
  // With single sign-on the only way in, a password still opens an administrator's account (the provider may be down).
  if (!passwordsSignIn() && !user.roles.includes('admin')) {
    throw createError({ status: 403, statusMessage: 'Forbidden', message: `Sign in through ${ssoSettings()?.name ?? 'your organisation'}: passwords do not sign in here.` })
  }
  await attemptSucceeded(ticket)
  await beginSession(event, user)
  return user.toPublic()
}

const reauthenticating = new Map<string, Promise<unknown>>()
/**
 * One re-authentication at a time per account in this process: each is counted, then checked, then
 * settled before the next is admitted, so parallel right passwords (two tabs signing) all pass and
 * parallel guesses stop at the limit. (Sign-in counts unsettled attempts as failures instead.)
 */
function oneAtATimeFor<T>(account: string, work: () => Promise<T>): Promise<T> {
  const run = (reauthenticating.get(account) ?? Promise.resolve()).then(work)
  const settled = run.catch(() => undefined)
  reauthenticating.set(account, settled)
  void settled.then(() => reauthenticating.get(account) === settled && reauthenticating.delete(account))
  return run
}

/** What a wrong password to re-authenticate is answered with: the status, the words, the field. */
export interface ReauthenticationRefusal {
  status: 401 | 422
  message: string
  field: string
}

/**
 * The signed-in user proves again that it is them (to sign, countersign, change their password),
 * counted like a sign-in: each attempt recorded before its check against the same per-account and
 * per-address limits. When they are reached, the session making the guesses is ended, so a stolen
 * live session cannot guess its way past the sign-in lockout.
 */
export async function reauthenticate(
  event: H3Event,
  user: User,
  password: string,
  refusal: ReauthenticationRefusal,
): Promise<void> {
  const endThisSession = async () => {
    const sessionId = event.context.sessionId as number | undefined
    if (sessionId) await endSession(sessionId, 'reauthentication-locked')
    await clearUserSession(event)
  }
  const matched = await oneAtATimeFor(user.email, async () => {
    let ticket
    try {
      ticket = await admitAttempt(event, user.email)
    }
    catch (error) {
      if ((error as { statusCode?: number }).statusCode === 429) await endThisSession()
      throw error
    }
    if (await checkPassword(user.passwordHash, password)) {
      await attemptSucceeded(ticket)
      return true
    }
    try {
      await refuseIfLockedOut(event, user.email, 'This session has been ended; sign in again once the lock has passed.')
    }
    catch (error) {
      await endThisSession()
      throw error
    }
    return false
  })
  if (matched) return
  throw createError({
    status: refusal.status,
    statusMessage: refusal.status === 401 ? 'Unauthorized' : 'Unprocessable Entity',
    message: refusal.message,
    data: { issues: [{ path: [refusal.field], field: refusal.field, message: 'Not your password.' }] },
  })
}

/** Ends this request's session on the server and clears its cookie; harmless without one. */
export async function signOut(event: H3Event): Promise<void> {
  if (!hasSessionCookie(event)) return
  const live = await liveSession(event).catch((error) => {
    if (error instanceof SessionEnded) return null
    throw error
  })
  if (live) await endSession(live.session.id, 'signed-out')
  await clearUserSession(event)
}

/** The devices a user is signed in on, the current one marked. */
export async function devicesOf(userId: number, currentSessionId: number | undefined) {
  return (await openSessions(userId)).map(session => ({
    id: session.id, current: session.id === currentSessionId, userAgent: session.userAgent, address: session.address,
    signedInAt: session.createdAt.toISOString(), lastSeenAt: session.lastSeenAt.toISOString(),
  }))
}

/** Ends one of the user's own sessions; ending the current one signs out here. */
export async function endOwnSession(event: H3Event, user: User, id: number): Promise<void> {
  const session = await UserSession.findOne({ where: { id, userId: user.id } })
  if (!session) throw createError({ status: 404, statusMessage: 'Not Found', message: 'No such session of yours.' })
  const current = id === event.context.sessionId
  await endSession(session.id, current ? 'signed-out' : 'ended-by-user')
  if (current) await clearUserSession(event)
}

/** "Sign out everywhere else": every session of the user but the current one ends. */
export async function endOtherSessions(user: User, currentSessionId: number | undefined): Promise<void> {
  const current = currentSessionId ? await UserSession.findByPk(currentSessionId) : null
  await writeTransaction(transaction => endAllSessions(user, 'signed-out-everywhere', transaction, current ?? undefined))
}
