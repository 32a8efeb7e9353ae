import { extendZodWithOpenApi, OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi'
import { z, type ZodTypeAny } from 'zod'
import { ABILITIES } from '../../shared/abilities'
import { ENGINE_VERSION } from '../../shared/gas/version'
import { TOKEN_SCOPES } from '../../shared/types/api-token'
import { REQUEST_EXAMPLES } from './examples'
import { API_ROUTES } from './routes'
import type { ApiRoute } from './types'

extendZodWithOpenApi(z)

/** The token scopes that open an ability: a route a token cannot reach says so. */
function scopesFor(access: ApiRoute['access']): string[] {
  if (access === 'public') return []
  return Object.entries(TOKEN_SCOPES)
    .filter(([, scope]) => (scope.abilities as readonly string[]).includes(access))
    .map(([name]) => name)
}

function whoMayCall(access: ApiRoute['access']): string {
  if (access === 'public') return 'Open to anyone: no session or token needed.'
  const holders = ABILITIES[access]
  const roles = holders === 'signed-in' ? 'any signed-in user' : `the ${holders.join(' or ')} role`
  const scopes = scopesFor(access)
  const token = scopes.length
    ? `an API token with the scope ${scopes.join(' or ')}, of a user who holds it`
    : 'a browser session only (no API token scope opens it)'
  return `Needs ${roles} (ability \`${access}\`): ${token}.`
}

/**
 * The schema as OpenAPI can say it: a field a route refuses outright (`z.undefined()`, "leave it out") is left
 * out of the description — the object is strict, so it is refused all the same.
 */
function describable<T extends ZodTypeAny>(schema: T): T {
  if (!(schema instanceof z.ZodObject)) return schema
  const refused = Object.entries(schema.shape as Record<string, ZodTypeAny>)
    .filter(([, field]) => (field instanceof z.ZodOptional ? field.unwrap() : field) instanceof z.ZodUndefined)
    .map(([key]) => [key, true] as const)
  return (refused.length ? schema.omit(Object.fromEntries(refused)) : schema) as unknown as T
}

/** The tag a route is listed under: its first path segment after /api ("worksheets", "calc", "admin"). */
const tagOf = (path: string) => path.split('/')[2]!.replace(/\.json$/, '')

const ERROR_BODY = z.object({
  statusCode: z.number().int(),
  message: z.string().openapi({ description: 'What went wrong, in words; for bad input it names each field.' }),
  data: z.object({
    issues: z.array(z.object({
      field: z.string(),
      message: z.string(),
      path: z.array(z.union([z.string(), z.number()])),
    })),
  }).partial().optional(),
}).openapi('Problem')

function responses(route: ApiRoute) {
  const error = (description: string) => ({ description, content: { 'application/json': { schema: ERROR_BODY } } })
  const success = route.responseType === 'application/json'
    ? { description: 'Done.', content: { 'application/json': { schema: z.object({}).passthrough() } } }
    : { description: `The file (${route.responseType}).`, content: { [route.responseType]: { schema: z.string() } } }
  return {
    [route.status]: success,
    ...(route.params || route.query || route.body || route.requestType
      ? { 400: error('Bad input: `data.issues` names each field and what is wrong with it.') }
      : {}),
    ...(route.access === 'public' ? {} : { 401: error('No session, or an API token unknown, expired or revoked.') }),
    ...(route.access === 'public' ? {} : { 403: error('The role (or the token\'s scope) does not allow it.') }),
    ...(route.params ? { 404: error('No such record, or not one you may see.') } : {}),
    ...(route.method !== 'get' ? { 409: error('The record changed or is in a state that refuses this (the reason in words).') } : {}),
  }
}

function requestBody(route: ApiRoute, key: string) {
  const example = REQUEST_EXAMPLES[key]
  if (route.requestType === 'multipart/form-data') {
    const fields = (route.body as z.AnyZodObject | undefined) ?? z.object({})
    const schema = fields.extend({ file: z.string().openapi({ format: 'binary', description: 'The file itself.' }) })
    return { content: { 'multipart/form-data': { schema } } }
  }
  if (route.requestType) {
    return { content: { [route.requestType]: { schema: z.string().openapi({ format: route.requestType === 'text/csv' ? undefined : 'binary' }) } } }
  }
  if (!route.body) return undefined
  return { content: { 'application/json': { schema: describable(route.body), ...(example === undefined ? {} : { example }) } } }
}

/** The OpenAPI 3.1 description of every route under server/api, built from the shared zod schemas. */
export function buildOpenApiDocument(serverUrl = '/') {
  const registry = new OpenAPIRegistry()
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'nuxt-session',
    description: 'The browser session, after POST /api/auth/login.',
  })
  registry.registerComponent('securitySchemes', 'apiToken', {
    type: 'http',
    scheme: 'bearer',
    description: 'An API token (Your account → API tokens, or Admin for a system\'s account): `Authorization: Bearer cw_…`.',
  })
  for (const route of API_ROUTES) {
    const key = `${route.method.toUpperCase()} ${route.path}`
    const body = requestBody(route, key)
    const scopes = scopesFor(route.access)
    registry.registerPath({
      'method': route.method,
      'path': route.path,
      'operationId': `${route.method}${route.path.replace(/[^a-zA-Z0-9]+(\w)?/g, (_, next: string | undefined) => (next ?? '').toUpperCase())}`,
      'tags': [tagOf(route.path)],
      'summary': route.summary,
      'description': `${route.description}\n\n${whoMayCall(route.access)}`,
      'security': route.access === 'public' ? [] : [{ session: [] }, ...(scopes.length ? [{ apiToken: scopes }] : [])],
      'request': {
        ...(route.params ? { params: route.params as z.AnyZodObject } : {}),
        ...(route.query ? { query: route.query as z.AnyZodObject } : {}),
        ...(body ? { body } : {}),
      },
      'responses': responses(route),
      'x-chargewell-ability': route.access,
      'x-chargewell-source': route.file,
    } as Parameters<typeof registry.registerPath>[0])
  }
  const generator = new OpenApiGeneratorV31(registry.definitions)
  return generator.generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Chargewell API',
      version: ENGINE_VERSION,
      description: 'Nitrogen pre-charge targets, servicing worksheets, countersign, sizing and the fleet\'s registers. '
        + 'Every figure is recomputed by the server; records freeze their inputs, results, method and engine version. '
        + 'The approved maintenance data and local regulations govern.',
    },
    servers: [{ url: serverUrl }],
  })
}

export type OpenApiDocument = ReturnType<typeof buildOpenApiDocument>

/** The examples of bodies that do not parse with their route's schema (none, or the test fails). */
export function invalidExamples(): { key: string, issues: string }[] {
  const byKey = new Map(API_ROUTES.map(route => [`${route.method.toUpperCase()} ${route.path}`, route]))
  return Object.entries(REQUEST_EXAMPLES).flatMap(([key, example]) => {
    const schema: ZodTypeAny | undefined = byKey.get(key)?.body
    if (!schema) return [{ key, issues: 'no such route takes a JSON body' }]
    const parsed = schema.safeParse(example)
    return parsed.success ? [] : [{ key, issues: JSON.stringify(parsed.error.issues) }]
  })
}
