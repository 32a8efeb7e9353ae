import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import * as oidc from 'openid-client'
import { Op } from 'sequelize'
import { DEFAULT_PREFERENCES, ROLES, type Role } from '#shared/types/user'
import { appendAudit } from '../database/audit-chain'
import { Station, User } from '../models'
import { beginSession, sessionsChangedAfterCommit } from '../utils/session-store'

/**
 * Sign-in through the organisation's OpenID Connect provider (the authorisation code flow with PKCE, state and
 * nonce, by openid-client). The provider vouches for who the person is; Chargewell finds their account by the
 * provider's subject, or at the first sign-in by a verified e-mail (then links the subject), and takes their
 * roles and stations from the token's claims each time (audited when they change). Someone the provider
 * vouches for but Chargewell does not know is refused, unless the organisation lets accounts be created
 * (NUXT_OIDC_PROVISION) and a claim gives them a role. Signing a record still asks the signer's own password
 * or passkey: a single sign-on never signs.
 */

const FLOW_COOKIE = 'chargewell-sso'
const FLOW_SECONDS = 600

interface FlowState {
  verifier?: string
  state?: string
  nonce?: string
  next?: string
}

export interface SsoSettings {
  issuer: string
  clientId: string
  clientSecret: string
  name: string
  scopes: string
  rolesClaim: string
  roleMap: Record<string, Role> | null
  stationsClaim: string
  provision: boolean
  allowHttp: boolean
}

/** The single sign-on settings, or null when the organisation has none. */
export function ssoSettings(): SsoSettings | null {
  const config = useRuntimeConfig()
  if (!config.oidcIssuer || !config.oidcClientId) return null
  let roleMap: Record<string, Role> | null = null
  if (config.oidcRoleMap) {
    const parsed = typeof config.oidcRoleMap === 'string' ? JSON.parse(config.oidcRoleMap) : config.oidcRoleMap
    roleMap = Object.fromEntries(Object.entries(parsed as Record<string, string>)
      .filter((entry): entry is [string, Role] => (ROLES as readonly string[]).includes(entry[1])))
  }
  return {
    issuer: String(config.oidcIssuer),
    clientId: String(config.oidcClientId),
    clientSecret: String(config.oidcClientSecret),
    name: String(config.oidcName || 'your organisation'),
    scopes: String(config.oidcScopes || 'openid email profile'),
    rolesClaim: String(config.oidcRolesClaim || 'groups'),
    roleMap,
    stationsClaim: String(config.oidcStationsClaim || 'chargewell_stations'),
    provision: String(config.oidcProvision) === 'true',
    allowHttp: String(config.oidcAllowHttp) === 'true',
  }
}

/** Whether passwords sign in at all (administrators always may). */
export function passwordsSignIn(): boolean {
  const value = useRuntimeConfig().passwordSignIn
  return String(value) !== 'false'
}

/** How one signs in here, for the sign-in page. */
export function signInMethods() {
  const sso = ssoSettings()
  return { password: passwordsSignIn(), sso: sso ? { name: sso.name, start: '/api/auth/sso/start' } : null }
}

let discovered: Promise<oidc.Configuration> | undefined

function providerConfiguration(settings: SsoSettings): Promise<oidc.Configuration> {
  discovered ??= oidc.discovery(
    new URL(settings.issuer),
    settings.clientId,
    settings.clientSecret,
    undefined,
    settings.allowHttp ? { execute: [oidc.allowInsecureRequests] } : undefined,
  ).catch((error) => {
    discovered = undefined
    throw createError({ status: 502, statusMessage: 'Bad Gateway', message: `The identity provider did not answer: ${(error as Error).message}` })
  })
  return discovered
}

function flowSession(event: H3Event) {
  // Lax: the provider sends the browser back with a top-level navigation from its own site.
  return useSession<FlowState>(event, {
    name: FLOW_COOKIE,
    password: String(useRuntimeConfig().session.password),
    maxAge: FLOW_SECONDS,
    cookie: { sameSite: 'lax', httpOnly: true, secure: publicAddress(event).startsWith('https:') },
  })
}

const callbackAddress = (event: H3Event) => `${publicAddress(event)}/api/auth/sso/callback`

/** Where the browser goes to sign in at the provider; the flow's secrets wait in a sealed cookie for 10 minutes. */
export async function startSsoSignIn(event: H3Event, next: string | undefined): Promise<string> {
  const settings = ssoSettings()
  if (!settings) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Single sign-on is not set up here.' })
  const configuration = await providerConfiguration(settings)
  const verifier = oidc.randomPKCECodeVerifier()
  const state = oidc.randomState()
  const nonce = oidc.randomNonce()
  const session = await flowSession(event)
  await session.update({ verifier, state, nonce, next: next?.startsWith('/') && !next.startsWith('//') ? next : '/' })
  return oidc.buildAuthorizationUrl(configuration, {
    redirect_uri: callbackAddress(event),
    scope: settings.scopes,
    code_challenge: await oidc.calculatePKCECodeChallenge(verifier),
    code_challenge_method: 'S256',
    state,
    nonce,
  }).href
}

/** The refusal the sign-in page shows, in words. */
export class SsoRefusal extends Error {}

const asList = (value: unknown): string[] =>
  Array.isArray(value) ? value.map(String) : typeof value === 'string' ? value.split(/[\s,]+/).filter(Boolean) : []

function rolesFrom(claims: Record<string, unknown>, settings: SsoSettings): Role[] | undefined {
  if (!(settings.rolesClaim in claims)) return undefined
  const isRole = (group: string): group is Role => (ROLES as readonly string[]).includes(group)
  const roles = asList(claims[settings.rolesClaim])
    .map(group => (settings.roleMap ? settings.roleMap[group] : isRole(group) ? group : undefined))
    .filter((role): role is Role => !!role)
  return ROLES.filter(role => roles.includes(role))
}

/** The stations the claim names (by name or code; `*` = every station); undefined when the claim is absent. */
async function stationsFrom(claims: Record<string, unknown>, settings: SsoSettings) {
  if (!(settings.stationsClaim in claims)) return undefined
  const names = asList(claims[settings.stationsClaim])
  if (names.includes('*')) return null as number[] | null
  const stations = await Station.findAll({ where: { [Op.or]: [{ name: names }, { code: names }] }, order: [['id', 'ASC']] })
  return stations.map(station => station.id)
}

/**
 * The provider sent the browser back: the code is exchanged (PKCE, state and nonce checked by openid-client),
 * the account found or refused, its roles and stations taken from the claims, and a session begun.
 * Answers where to send the browser next.
 */
export async function finishSsoSignIn(event: H3Event): Promise<string> {
  const settings = ssoSettings()
  if (!settings) throw new SsoRefusal('Single sign-on is not set up here.')
  const session = await flowSession(event)
  const flow = session.data
  await session.clear()
  if (!flow.verifier || !flow.state) throw new SsoRefusal('The sign-in took too long or was started in another browser. Start it again.')
  const configuration = await providerConfiguration(settings)
  const current = new URL(getRequestURL(event).search, callbackAddress(event))
  let claims: Record<string, unknown>
  try {
    const tokens = await oidc.authorizationCodeGrant(configuration, current, {
      pkceCodeVerifier: flow.verifier,
      expectedState: flow.state,
      expectedNonce: flow.nonce,
      idTokenExpected: true,
    })
    const idClaims = tokens.claims()!
    const userInfo = await oidc.fetchUserInfo(configuration, tokens.access_token, idClaims.sub).catch(() => ({}))
    claims = { ...idClaims, ...userInfo }
  }
  catch (error) {
    throw new SsoRefusal(`The identity provider's answer could not be accepted: ${(error as Error).message}`)
  }
  const user = await accountFor(claims, settings)
  await beginSession(event, user)
  return flow.next ?? '/'
}

async function accountFor(claims: Record<string, unknown>, settings: SsoSettings): Promise<User> {
  const subject = String(claims.sub)
  const email = typeof claims.email === 'string' ? claims.email.trim().toLowerCase() : undefined
  const roles = rolesFrom(claims, settings)
  const stationIds = await stationsFrom(claims, settings)
  if (roles && roles.length === 0) {
    throw new SsoRefusal('Your organisation\'s sign-in gives you no Chargewell role. Ask your administrator to add you to a Chargewell group.')
  }
  return writeTransaction(async (transaction) => {
    let user = await User.findOne({ where: { oidcSubject: subject }, transaction, lock: transaction.LOCK.UPDATE })
    if (!user && email && claims.email_verified !== false) {
      user = await User.findOne({ where: { email, oidcSubject: null }, transaction, lock: transaction.LOCK.UPDATE })
    }
    if (!user) {
      if (!settings.provision || !email || !roles) {
        throw new SsoRefusal(`${email ?? 'This account'} has no Chargewell account. Ask an administrator to add you.`)
      }
      user = await User.create({
        email,
        name: typeof claims.name === 'string' && claims.name.trim() ? claims.name.trim().slice(0, 120) : email,
        // No password: this account signs in through the provider and signs records with a passkey.
        passwordHash: await hashPassword(randomBytes(32).toString('base64url')),
        roles,
        authorisationNumber: null,
        preferences: DEFAULT_PREFERENCES,
        oidcSubject: subject,
        stationIds: stationIds ?? null,
      }, { transaction })
      await appendAudit({ actorId: null, entity: 'user', entityId: String(user.id), action: 'created', detail: { roles, by: 'single sign-on' } }, transaction)
      return user
    }
    if (user.disabled) throw new SsoRefusal('This account is disabled. Ask an administrator to enable it.')
    const audited = (action: string, detail: Record<string, unknown>) =>
      appendAudit({ actorId: null, entity: 'user', entityId: String(user!.id), action, detail: { ...detail, by: 'single sign-on' } }, transaction)
    if (!user.oidcSubject) {
      await user.update({ oidcSubject: subject }, { transaction })
      await audited('updated', { changes: { oidcSubject: { from: null, to: subject } } })
    }
    const held = [...user.roles].sort((a, b) => ROLES.indexOf(a) - ROLES.indexOf(b))
    if (roles && roles.join() !== held.join()) {
      // As when an administrator changes them: every other session of the user ends.
      await user.update({ roles, sessionVersion: user.sessionVersion + 1 }, { transaction })
      await audited('roles-changed', { from: held, to: roles })
      sessionsChangedAfterCommit(user.id, transaction)
    }
    if (stationIds !== undefined && JSON.stringify(stationIds) !== JSON.stringify(user.stationIds ?? null)) {
      const from = { stationIds: user.stationIds ?? null, operatorIds: user.operatorIds ?? null }
      await user.update({ stationIds }, { transaction })
      await audited('scope-changed', { from, to: { stationIds, operatorIds: user.operatorIds ?? null } })
      sessionsChangedAfterCommit(user.id, transaction)
    }
    return user
  })
}
