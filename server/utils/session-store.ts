import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { User, UserSession } from '../models'
import type { SessionEndReason } from '../models/user-session'

/**
 * The session store, below the services and beside `auth.ts`: server-side sessions behind the
 * sealed cookie. The cookie carries a random token naming a
 * row in user_sessions; the row counts only while it has not ended and its session version is
 * still the user's. Sign-out ends the row; a password change or reset, disabling, a role change
 * and "sign out everywhere" bump the user's version, which ends every row at once — on every
 * server instance, since each request reads the row.
 */
const SESSION_COOKIE = 'nuxt-session'
const TOUCH_EVERY_MS = 60_000

/**
 * Checked sessions, by the sealed cookie's value, for a few seconds: most requests then need
 * neither the unsealing nor a database read. Anything that must take effect at once (sign-out,
 * a version bump, a change to the user) drops the user's entries when its write commits; with
 * several servers, each drops them when told (see notifySessionChange).
 */
const CACHE_MS = 5_000
const CACHE_LIMIT = 10_000
const checked = new Map<string, { live: LiveSession, until: number }>()

/** Forgets the checked sessions of one user (or of everyone). */
export function forgetSessions(userId?: number): void {
  for (const [key, entry] of checked) if (userId === undefined || entry.live.user.id === userId) checked.delete(key)
}

let broadcast: ((userId: number) => void) | undefined

/** Lets other server instances know (PostgreSQL NOTIFY); set up by the database plugin. */
export function onSessionChangeBroadcast(send: (userId: number) => void): void {
  broadcast = send
}

/** After the write commits: this server forgets the user's checked sessions, and tells the others. */
export function sessionsChangedAfterCommit(userId: number, transaction?: Transaction): void {
  const forget = () => {
    forgetSessions(userId)
    broadcast?.(userId)
  }
  if (transaction) transaction.afterCommit(forget)
  else forget()
}

export class SessionEnded extends Error {}

/** Whether the request carries a session cookie at all (without opening, or minting, one). */
export function hasSessionCookie(event: H3Event): boolean {
  return Boolean(getCookie(event, useRuntimeConfig().session?.name || SESSION_COOKIE))
}

/** Starts a session for a user who has just proved who they are, and seals it into the cookie. */
export async function beginSession(event: H3Event, user: User): Promise<UserSession> {
  const token = randomBytes(32).toString('base64url')
  const now = new Date()
  const session = await writeTransaction(transaction =>
    UserSession.create(
      {
        token,
        userId: user.id,
        sessionVersion: user.sessionVersion,
        userAgent: (getRequestHeader(event, 'user-agent') ?? '').slice(0, 300) || null,
        address: clientAddress(event),
        lastSeenAt: now,
        endedAt: null,
        endReason: null,
      },
      { transaction },
    ),
  )
  await replaceUserSession(
    event,
    { user: sessionUser(user), token, loggedInAt: now.toISOString() },
    { cookie: { secure: arrivedSecurely(event) } },
  )
  return session
}

/**
 * Whether the browser reached us over TLS (as forwarded by a trusted proxy) or on localhost, which
 * browsers treat as secure. Only then is the session cookie marked Secure: over plain HTTP on a LAN
 * address a browser drops a Secure cookie, and sign-in would silently fail. Production runs on HTTPS.
 */
function arrivedSecurely(event: H3Event): boolean {
  const url = requestedURL(event)
  return url.protocol === 'https:' || ['localhost', '127.0.0.1', '[::1]'].includes(url.hostname)
}

export interface LiveSession {
  user: User
  session: UserSession
}

/**
 * The user and session row behind the request's cookie, if the session still counts; null
 * for no cookie or no session in it. A session that has ended throws SessionEnded.
 */
export async function liveSession(event: H3Event): Promise<LiveSession | null> {
  const sealed = getCookie(event, useRuntimeConfig().session?.name || SESSION_COOKIE)
  if (!sealed) return null
  const hit = checked.get(sealed)
  if (hit && hit.until > Date.now()) return hit.live
  const live = await checkSession(event)
  if (live) {
    if (checked.size >= CACHE_LIMIT) checked.delete(checked.keys().next().value!)
    checked.set(sealed, { live, until: Date.now() + CACHE_MS })
  }
  return live
}

async function checkSession(event: H3Event): Promise<LiveSession | null> {
  const data = await getUserSession(event)
  if (!data.user) return null
  const token = typeof data.token === 'string' ? data.token : null
  if (!token) throw new SessionEnded('This session is from before server-side sessions; sign in again.')
  await useDB()
  const session = await UserSession.findOne({ where: { token }, include: [{ model: User, as: 'user' }] })
  const user = (session as (UserSession & { user?: User }) | null)?.user
  if (!session || !user || session.userId !== data.user.id)
    throw new SessionEnded('Your session was not found; sign in again.')
  if (session.endedAt) throw new SessionEnded(endedMessage(session.endReason))
  if (user.disabled)
    throw new SessionEnded('Your account is no longer active. Please sign in again or ask an administrator.')
  if (session.sessionVersion !== user.sessionVersion)
    throw new SessionEnded('Your sign-in has ended because your password or access changed. Please sign in again.')
  if (Date.now() - session.lastSeenAt.getTime() > TOUCH_EVERY_MS) {
    const seen = new Date()
    // Best-effort: a full disk must not refuse reads because "last seen" could not be written.
    await writeTransaction(transaction =>
      UserSession.update({ lastSeenAt: seen }, { where: { id: session.id }, transaction }),
    ).then(() => (session.lastSeenAt = seen), (error) => {
      if (!storageFault(error) && (error as { statusCode?: number }).statusCode !== 503) throw error
    })
  }
  return { user, session }
}

function endedMessage(reason: SessionEndReason | null): string {
  switch (reason) {
    case 'signed-out':
      return 'You signed out of this session. Please sign in again.'
    case 'reauthentication-locked':
      return 'This session was ended after too many wrong passwords. Sign in again once the lock has passed.'
    case 'ended-by-user':
    case 'signed-out-everywhere':
      return 'This session was ended from another device. Please sign in again.'
    default:
      return 'Your sign-in has ended because your password or access changed. Please sign in again.'
  }
}

/** Ends one session (sign-out, or the user ending one of their devices). */
export async function endSession(
  sessionId: number,
  reason: SessionEndReason,
  transaction?: Transaction,
): Promise<void> {
  const end = async (inside: Transaction) => {
    const session = await UserSession.findByPk(sessionId, { attributes: ['id', 'userId'], transaction: inside })
    await UserSession.update(
      { endedAt: new Date(), endReason: reason },
      { where: { id: sessionId, endedAt: null }, transaction: inside },
    )
    if (session) sessionsChangedAfterCommit(session.userId, inside)
  }
  await (transaction ? end(transaction) : writeTransaction(end))
}

/**
 * Ends every session of a user by bumping their session version, inside the caller's write;
 * `keep` (the session making the change) is carried over to the new version.
 */
export async function endAllSessions(
  user: User,
  reason: SessionEndReason,
  transaction: Transaction,
  keep?: UserSession,
): Promise<void> {
  // Incremented in the database, not from what this request read, so two bumps at once both count.
  await User.increment({ sessionVersion: 1 }, { where: { id: user.id }, transaction })
  const next = (await User.findByPk(user.id, { attributes: ['sessionVersion'], transaction }))!.sessionVersion
  user.sessionVersion = next
  await UserSession.update(
    { endedAt: new Date(), endReason: reason },
    {
      where: { userId: user.id, endedAt: null, ...(keep ? { id: { [Op.ne]: keep.id } } : {}) },
      transaction,
    },
  )
  if (keep) await UserSession.update({ sessionVersion: next }, { where: { id: keep.id }, transaction })
  sessionsChangedAfterCommit(user.id, transaction)
}

/** A user's sessions still open, newest first (for "signed in on 2 devices"). */
export async function openSessions(userId: number): Promise<UserSession[]> {
  const sessions = await UserSession.findAll({
    where: { userId, endedAt: null },
    order: [['lastSeenAt', 'DESC']],
    include: [{ model: User, as: 'user', attributes: ['sessionVersion'] }],
  })
  return sessions.filter(
    session => session.sessionVersion === (session as UserSession & { user?: User }).user?.sessionVersion,
  )
}
