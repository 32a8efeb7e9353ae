/**
 * A real OpenID Connect provider for the single sign-on tests (`oidc-provider`, the certified OpenID Connect
 * provider library for Node), on this machine: it knows the people given, signs in whoever `signInAs` names at
 * once (no login form), and consents to what Chargewell asks.
 */
import { createServer } from 'node:http'
import Provider, { type Configuration } from 'oidc-provider'

export const CLIENT = { id: 'chargewell', secret: 'a-client-secret-only-for-tests' }

export async function startIdentityProvider(
  port: number,
  redirectUri: string,
  people: Record<string, Record<string, unknown>>,
) {
  const issuer = `http://127.0.0.1:${port}`
  let accountId = Object.keys(people)[0]!
  const configuration: Configuration = {
    clients: [{
      client_id: CLIENT.id,
      client_secret: CLIENT.secret,
      redirect_uris: [redirectUri],
      grant_types: ['authorization_code'],
      response_types: ['code'],
    }],
    claims: {
      openid: ['sub'],
      email: ['email', 'email_verified'],
      profile: ['name'],
      chargewell: ['groups', 'chargewell_stations'],
    },
    findAccount: (_context, sub) => ({ accountId: sub, claims: () => ({ sub, ...people[sub] }) }),
    features: { devInteractions: { enabled: false } },
    interactions: { url: (_context, interaction) => `/interaction/${interaction.uid}` },
    cookies: { keys: ['only-for-tests'] },
  }
  const provider = new Provider(issuer, configuration)
  const handle = provider.callback()
  const server = createServer((request, response) => {
    if (!request.url?.startsWith('/interaction/')) return void handle(request, response)
    void (async () => {
      const details = await provider.interactionDetails(request, response)
      if (details.prompt.name === 'login') {
        const login = { login: { accountId } }
        return provider.interactionFinished(request, response, login, { mergeWithLastSubmission: false })
      }
      const clientId = String(details.params.client_id)
      const grant = new provider.Grant({ accountId: details.session!.accountId, clientId })
      const missing = details.prompt.details as { missingOIDCScope?: string[], missingOIDCClaims?: string[] }
      if (missing.missingOIDCScope) grant.addOIDCScope(missing.missingOIDCScope.join(' '))
      if (missing.missingOIDCClaims) grant.addOIDCClaims(missing.missingOIDCClaims)
      const consent = { consent: { grantId: await grant.save() } }
      return provider.interactionFinished(request, response, consent, { mergeWithLastSubmission: true })
    })().catch((error) => {
      response.statusCode = 500
      response.end(String(error))
    })
  })
  await new Promise<void>(listening => server.listen(port, '127.0.0.1', listening))
  return {
    issuer,
    signInAs: (sub: string) => void (accountId = sub),
    close: () => new Promise<void>(closed => server.close(() => closed())),
  }
}

/** The settings a Chargewell server needs to use it (the group names map to roles). */
export function ssoEnvironment(issuer: string): Record<string, string> {
  return {
    NUXT_OIDC_ISSUER: issuer,
    NUXT_OIDC_CLIENT_ID: CLIENT.id,
    NUXT_OIDC_CLIENT_SECRET: CLIENT.secret,
    NUXT_OIDC_NAME: 'Fellmoor sign-in',
    NUXT_OIDC_SCOPES: 'openid email profile chargewell',
    NUXT_OIDC_ROLE_MAP: JSON.stringify({ 'mro-technicians': 'technician', 'mro-inspectors': 'inspector', 'mro-engineering': 'engineer' }),
    NUXT_OIDC_ALLOW_HTTP: 'true',
  }
}
