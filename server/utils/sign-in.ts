import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { LoginAttempt } from '../models'

/**
 * Sign-in throttling that holds under parallel guessing. Each attempt is counted and recorded
 * in one write (the single writer's queue), before its password is checked, so 150 guesses
 * sent at once are admitted one by one and the sixth already finds five recorded. An attempt
 * counts as failed until its password proves right.
 */
export interface AttemptTicket {
  id: number
}

function limits() {
  const config = useRuntimeConfig()
  return {
    perAccount: Number(config.loginAccountFailures),
    perAddress: Number(config.loginAddressFailures),
    windowMs: Number(config.loginWindowMinutes) * 60_000,
  }
}

/** The client's address; behind a reverse proxy (NUXT_TRUST_PROXY=true) the first X-Forwarded-For hop. */
export function clientAddress(event: H3Event): string {
  return (getRequestIP(event, { xForwardedFor: trustsProxy() }) ?? 'unknown').slice(0, 64)
}

function refuse(event: H3Event, unlockAt: number, now: number, message: string): never {
  const retryAfterSeconds = Math.max(1, Math.ceil((unlockAt - now) / 1000))
  setResponseHeader(event, 'Retry-After', retryAfterSeconds)
  throw createError({
    status: 429,
    statusMessage: 'Too Many Requests',
    message: `${message} Try again in ${Math.ceil(retryAfterSeconds / 60)} minute(s).`,
    data: { retryAfterSeconds },
  })
}

/** When the account or the address is locked out, until when and why; null while attempts are allowed. */
async function lockout(
  email: string,
  address: string,
  now: number,
  transaction?: Transaction,
): Promise<{ unlockAt: number, message: string } | null> {
  const { perAccount, perAddress, windowMs } = limits()
  const windowStart = new Date(now - windowMs)
  const lastSuccess = await LoginAttempt.max<Date, LoginAttempt>('at', {
    where: { email, succeeded: true },
    transaction,
  })
  const since = new Date(Math.max(windowStart.getTime(), lastSuccess ? new Date(lastSuccess).getTime() + 1 : 0))
  const accountFailures = await LoginAttempt.findAll({
    where: { email, succeeded: false, at: { [Op.gte]: since } },
    order: [['at', 'DESC']],
    limit: perAccount,
    transaction,
  })
  if (accountFailures.length >= perAccount) {
    return {
      unlockAt: accountFailures[perAccount - 1]!.at.getTime() + windowMs,
      message: 'Too many failed sign-ins for this account.',
    }
  }
  const addressFailures = await LoginAttempt.findAll({
    where: { address, succeeded: false, at: { [Op.gte]: windowStart } },
    order: [['at', 'DESC']],
    limit: perAddress,
    transaction,
  })
  if (addressFailures.length >= perAddress) {
    return {
      unlockAt: addressFailures[perAddress - 1]!.at.getTime() + windowMs,
      message: 'Too many failed sign-ins from this network address.',
    }
  }
  return null
}

/** Admits one attempt (recording it as failed for now) or refuses it with 429 and the wait. */
export async function admitAttempt(event: H3Event, email: string): Promise<AttemptTicket> {
  const address = clientAddress(event)
  return writeTransaction(async (transaction) => {
    const sequelize = LoginAttempt.sequelize!
    if (sequelize.getDialect() === 'postgres') {
      // Several servers: the count-then-record below holds one attempt at a time per account and per address
      // (SQLite's single writer already does this).
      for (const key of [`login:${email}`, `login-address:${address}`]) {
        await sequelize.query('SELECT pg_advisory_xact_lock(hashtext(:key))', { replacements: { key }, transaction })
      }
    }
    const now = Date.now()
    const locked = await lockout(email, address, now, transaction)
    if (locked) refuse(event, locked.unlockAt, now, locked.message)
    const attempt = await LoginAttempt.create({ email, succeeded: false, at: new Date(now), address }, { transaction })
    return { id: attempt.id }
  })
}

/** Refuses with 429 and the wait when the account or this address is locked out now (records nothing). */
export async function refuseIfLockedOut(event: H3Event, email: string, message: string): Promise<void> {
  const now = Date.now()
  const locked = await lockout(email, clientAddress(event), now)
  if (locked) refuse(event, locked.unlockAt, now, `${locked.message} ${message}`)
}

export async function attemptSucceeded(ticket: AttemptTicket): Promise<void> {
  await writeTransaction(transaction =>
    LoginAttempt.update({ succeeded: true }, { where: { id: ticket.id }, transaction }),
  )
}

let dummyHash: Promise<string> | undefined

/**
 * Checks a password against the account's hash, or against a throw-away hash when there is
 * no such account, so an unknown address takes as long as a known one.
 */
export async function checkPassword(passwordHash: string | undefined, password: string): Promise<boolean> {
  dummyHash ??= hashPassword(`no-account-${Math.random()}`)
  const matches = await verifyPassword(passwordHash ?? (await dummyHash), password)
  return passwordHash !== undefined && matches
}
