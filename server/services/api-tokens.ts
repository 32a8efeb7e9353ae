import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { Ability } from '#shared/abilities'
import type { ApiTokenCreateBody } from '#shared/schemas/api-token'
import { TOKEN_SCOPES, type ApiTokenDto, type TokenScope } from '#shared/types/api-token'
import { appendAudit } from '../database/audit-chain'
import { ApiToken, User } from '../models'
import { notFound } from './audited-writes'

/**
 * API tokens: another system calls the API as a user, within the token's scopes, until it expires or is
 * revoked. The token is shown once, at issue; only its SHA-256 is kept. Every use is audited, and each
 * token is rate-limited on its own (NUXT_API_TOKEN_RATE_PER_MINUTE, 120 by default).
 */

const hashOf = (token: string) => createHash('sha256').update(token).digest('hex')

function unauthorised(message: string): never {
  throw createError({ status: 401, statusMessage: 'Unauthorized', message })
}

export function toApiTokenDto(token: ApiToken & { user?: User }): ApiTokenDto {
  return {
    id: token.id,
    userId: token.userId,
    userName: token.user?.name ?? '',
    name: token.name,
    prefix: token.prefix,
    scopes: token.scopes,
    expiresAt: token.expiresAt.toISOString(),
    revokedAt: token.revokedAt?.toISOString() ?? null,
    lastUsedAt: token.lastUsedAt?.toISOString() ?? null,
    createdAt: token.createdAt.toISOString(),
    live: !token.revokedAt && token.expiresAt.getTime() > Date.now(),
  }
}

/** Issues a token for `holderId` (oneself, or — an administrator — a system's account). The answer holds it once. */
export async function issueToken(
  actor: User,
  holderId: number,
  body: ApiTokenCreateBody,
): Promise<ApiTokenDto & { token: string }> {
  const holder = await User.findByPk(holderId)
  if (!holder) notFound('User')
  const token = `cw_${randomBytes(32).toString('base64url')}`
  const created = await writeTransaction(async (transaction) => {
    const row = await ApiToken.create({
      userId: holder.id,
      name: body.name,
      prefix: token.slice(0, 10),
      tokenHash: hashOf(token),
      scopes: body.scopes,
      expiresAt: new Date(Date.now() + body.expiresInDays * 86_400_000),
      createdById: actor.id,
    }, { transaction })
    await appendAudit({
      actorId: actor.id,
      entity: 'api-token',
      entityId: String(row.id),
      action: 'issued',
      detail: {
        holderId: holder.id,
        name: body.name,
        scopes: body.scopes,
        expiresAt: row.expiresAt.toISOString(),
        prefix: row.prefix,
      },
    }, transaction)
    return row
  })
  return { ...toApiTokenDto(Object.assign(created, { user: holder })), token }
}

export async function listTokens(holderId?: number): Promise<ApiTokenDto[]> {
  const rows = await ApiToken.findAll({
    where: holderId === undefined ? {} : { userId: holderId },
    include: [{ model: User, as: 'user', attributes: ['id', 'name'] }],
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
  })
  return rows.map(toApiTokenDto)
}

/** Revokes a token (its holder's, or any for an administrator); it never works again. Audited. */
export async function revokeToken(actor: User, id: number, holderId?: number): Promise<ApiTokenDto> {
  const token = await writeTransaction(async (transaction) => {
    const row = await ApiToken.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row || (holderId !== undefined && row.userId !== holderId)) notFound('Token')
    if (!row.revokedAt) {
      await row.update({ revokedAt: new Date() }, { transaction })
      await appendAudit({ actorId: actor.id, entity: 'api-token', entityId: String(id), action: 'revoked', detail: { prefix: row.prefix } }, transaction)
    }
    return row
  })
  return toApiTokenDto(Object.assign(token, { user: await User.findByPk(token.userId, { attributes: ['id', 'name'] }) ?? undefined }))
}

/** Requests each token made within the last minute (this server's count). */
const recent = new Map<number, number[]>()

function withinRate(tokenId: number): boolean {
  const limit = Number(useRuntimeConfig().apiTokenRatePerMinute) || 120
  const now = Date.now()
  const times = (recent.get(tokenId) ?? []).filter(at => now - at < 60_000)
  if (times.length >= limit) {
    recent.set(tokenId, times)
    return false
  }
  times.push(now)
  recent.set(tokenId, times)
  return true
}

/** The bearer token of a request, if it sends one. */
export function bearerOf(event: H3Event): string | null {
  const header = getRequestHeader(event, 'authorization')
  const match = header?.match(/^Bearer\s+(\S+)$/i)
  return match ? match[1]! : null
}

/**
 * The user a token acts for, if the token is known, live, within its rate and scoped for `ability`; every use
 * is audited (method and path). Refusals: 401 unknown / revoked / expired / disabled user, 403 out of scope,
 * 429 over the rate.
 */
export async function userOfToken(event: H3Event, token: string, ability: Ability): Promise<User> {
  const row = await ApiToken.findOne({ where: { tokenHash: hashOf(token) }, include: [{ model: User, as: 'user' }] })
  const user = (row as (ApiToken & { user?: User }) | null)?.user
  if (!row || !user) unauthorised('This API token is not known.')
  if (row.revokedAt) unauthorised(`This API token (${row.prefix}…) was revoked on ${row.revokedAt.toISOString().slice(0, 10)}.`)
  if (row.expiresAt.getTime() <= Date.now()) unauthorised(`This API token (${row.prefix}…) expired on ${row.expiresAt.toISOString().slice(0, 10)}.`)
  if (user.disabled) unauthorised('The account this API token acts for is disabled.')
  const grants = (scope: TokenScope) =>
    !!(TOKEN_SCOPES[scope]?.abilities as readonly Ability[] | undefined)?.includes(ability)
  const scoped = row.scopes.some(grants)
  if (!scoped) {
    const needed = (Object.keys(TOKEN_SCOPES) as TokenScope[]).filter(grants)
    throw createError({
      status: 403,
      statusMessage: 'Forbidden',
      message: needed.length
        ? `This API token's scopes (${row.scopes.join(', ')}) do not include ${needed.join(' or ')}.`
        : 'API tokens cannot use this route: sign in.',
    })
  }
  if (!withinRate(row.id)) {
    setResponseHeader(event, 'retry-after', 60)
    throw createError({
      status: 429,
      statusMessage: 'Too Many Requests',
      message: 'This API token made too many requests this minute; try again shortly.',
    })
  }
  await writeTransaction(async (transaction) => {
    await ApiToken.update({ lastUsedAt: new Date() }, { where: { id: row.id }, transaction })
    await appendAudit({
      actorId: user.id,
      entity: 'api-token',
      entityId: String(row.id),
      action: 'used',
      detail: { method: event.method, path: event.path.split('?')[0] },
    }, transaction)
  })
  event.context.apiTokenId = row.id
  return user
}
