/**
 * Writes server/openapi/routes.ts, the table the OpenAPI description is built from, by reading every file
 * under server/api: its method and path (from the file name), its words (the comment above the handler),
 * who may call it (tests/api/route-access.ts, which the role test holds to the code) and the shared zod
 * schemas it validates its path, query and body with (the identifiers passed to `validateWith` or
 * `parseInput`, followed to their import). Nothing about a route is written twice by hand, so nothing can
 * drift: tests/unit/openapi.test.ts runs this again and fails when the committed table differs.
 *
 *   npm run openapi:routes
 */
import { readdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { ROUTE_ACCESS } from '../tests/api/route-access'

const ROOT = fileURLToPath(new URL('..', import.meta.url))
const API = join(ROOT, 'server/api')
export const ROUTE_TABLE = 'server/openapi/routes.ts'

/** What a route answers when it is not JSON (by path; the rest answer JSON). */
const RESPONSE_TYPES: [RegExp, string][] = [
  [/^GET \/api\/audit\/export$/, 'application/x-ndjson'],
  [/^GET \/api\/(aircraft|accumulators|tools|specifications|worksheets|due)\/export$/, 'text/csv'],
  [/^GET \/api\/studies\/\{id\}\/csv$/, 'text/csv'],
  [/^GET \/api\/(worksheets|studies)\/\{id\}\/pdf$/, 'application/pdf'],
  [/^GET \/api\/due\/calendar$/, 'text/calendar'],
  [/^GET \/api\/accumulators\/\{id\}\/label$/, 'image/svg+xml'],
  [/^GET \/api\/attachments\/\{id\}$/, 'application/octet-stream'],
  [/^GET \/api\/records\/archive$/, 'application/zip'],
]
/** What a route takes when it is not JSON. */
const REQUEST_TYPES: [RegExp, string][] = [
  [/^POST \/api\/[a-z]+\/import$/, 'text/csv'],
  [/^POST \/api\/records\/verify$/, 'application/pdf'],
  [/^POST \/api\/attachments$/, 'multipart/form-data'],
]

interface Found {
  file: string
  method: string
  path: string
  key: string
  summary: string
  description: string
  access: string
  status: number
  params?: string
  query?: string
  body?: string
  requestType?: string
  responseType: string
}

function filesUnder(folder: string): string[] {
  return readdirSync(folder, { withFileTypes: true }).flatMap(entry =>
    entry.isDirectory() ? filesUnder(join(folder, entry.name)) : entry.name.endsWith('.ts') ? [join(folder, entry.name)] : [])
}

/** `server/api/worksheets/[id]/sign.post.ts` → POST, `/api/worksheets/[id]/sign`. */
export function routeOfFile(file: string): { method: string, route: string } {
  const name = relative(API, file).replace(/\\/g, '/').replace(/\.ts$/, '')
  const match = /^(.*?)(?:\.(get|post|patch|put|delete))$/.exec(name)
  if (!match) throw new Error(`${file}: a route file is named <path>.<method>.ts`)
  const route = `/api/${match[1]!}`.replace(/\/index$/, '')
  return { method: match[2]!.toUpperCase(), route }
}

/** The comment just above `export default`, as sentences: the first is the summary. */
function wordsOf(source: string, file: string): { summary: string, description: string } {
  const before = source.slice(0, source.indexOf('export default'))
  const comment = /\/\*\*([\s\S]*?)\*\/\s*$/.exec(before)
  if (!comment) throw new Error(`${file}: say what the route does in a /** comment */ above the handler`)
  const description = comment[1]!
    .split('\n')
    .map(line => line.replace(/^\s*\*\s?/, '').trim())
    .filter(Boolean)
    .join(' ')
    .replace(/^(GET|POST|PATCH|PUT|DELETE) \/api\/\S+ — (\w)/, (_, _method: string, first: string) => first.toUpperCase())
  const summary = (/^(.+?[.:!?])(\s|$)/.exec(description)?.[1] ?? description).replace(/[.:]$/, '')
  return { summary: summary.length > 160 ? `${summary.slice(0, 157)}…` : summary, description }
}

/** The identifier a validation call is given, and the module it is imported from. */
function schemaOf(source: string, file: string, call: RegExp): string | undefined {
  const name = call.exec(source)?.[1]
  if (!name) return undefined
  for (const line of source.matchAll(/import \{([^}]+)\} from '([^']+)'/g)) {
    const names = line[1]!.split(',').map(part => part.trim().replace(/^type\s+/, ''))
    if (names.includes(name)) {
      if (!line[2]!.startsWith('#shared/schemas/')) throw new Error(`${file}: ${name} comes from ${line[2]}; keep route schemas in shared/schemas`)
      return `${line[2]!.slice('#shared/schemas/'.length)}#${name}`
    }
  }
  throw new Error(`${file}: ${name} is not imported from shared/schemas (a schema written in a route file is not described)`)
}

export function findRoutes(): Found[] {
  return filesUnder(API)
    .sort()
    .map((file) => {
      const source = readFileSync(file, 'utf8')
      const { method, route } = routeOfFile(file)
      const key = `${method} ${route}`
      const access = ROUTE_ACCESS[key]
      if (!access) throw new Error(`${key}: add it to tests/api/route-access.ts`)
      const path = route.replace(/\[(\w+)\]/g, '{$1}')
      const shown = `${method} ${path}`
      return {
        file: relative(ROOT, file).replace(/\\/g, '/'),
        method: method.toLowerCase(),
        path,
        key,
        ...wordsOf(source, file),
        access,
        status: Number(/setResponseStatus\(event, (\d{3})\)/.exec(source)?.[1] ?? 200),
        params: schemaOf(source, file, /getValidatedRouterParams\(event, validateWith\((\w+)\)\)/),
        query: schemaOf(source, file, /getValidatedQuery\(event, validateWith\((\w+)\)\)/),
        body: schemaOf(source, file, /readValidatedBody\(event, validateWith\((\w+)\)\)/)
          ?? schemaOf(source, file, /parseInput\((\w+),/),
        requestType: REQUEST_TYPES.find(([pattern]) => pattern.test(shown))?.[1],
        responseType: RESPONSE_TYPES.find(([pattern]) => pattern.test(shown))?.[1] ?? 'application/json',
      }
    })
}

/** The text of server/openapi/routes.ts. */
export function routeTable(): string {
  const routes = findRoutes()
  const modules = new Map<string, Set<string>>()
  for (const route of routes) {
    for (const schema of [route.params, route.query, route.body]) {
      if (!schema) continue
      const [module, name] = schema.split('#') as [string, string]
      if (!modules.has(module)) modules.set(module, new Set())
      modules.get(module)!.add(name)
    }
  }
  const imports = [...modules.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([module, names]) => `import { ${[...names].sort().join(', ')} } from '../../shared/schemas/${module}'`)
  const ref = (schema?: string) => (schema ? schema.split('#')[1] : 'undefined')
  const rows = routes.map(route => [
    '  {',
    `    method: '${route.method}',`,
    `    path: '${route.path}',`,
    `    file: '${route.file}',`,
    `    summary: ${JSON.stringify(route.summary).replace(/'/g, '\\\'').replace(/^"|"$/g, '\'').replace(/\\"/g, '"')},`,
    `    description: ${JSON.stringify(route.description).replace(/'/g, '\\\'').replace(/^"|"$/g, '\'').replace(/\\"/g, '"')},`,
    `    access: '${route.access}',`,
    `    status: ${route.status},`,
    `    params: ${ref(route.params)},`,
    `    query: ${ref(route.query)},`,
    `    body: ${ref(route.body)},`,
    ...(route.requestType ? [`    requestType: '${route.requestType}',`] : []),
    `    responseType: '${route.responseType}',`,
    '  },',
  ].join('\n'))
  return [
    '// Written by `npm run openapi:routes` (scripts/openapi-routes.ts) from the files under server/api: do not edit.',
    '// tests/unit/openapi.test.ts fails when a route is added, removed or changed and this table is not written again.',
    ...imports,
    'import type { ApiRoute } from \'./types\'',
    '',
    'export const API_ROUTES: ApiRoute[] = [',
    ...rows,
    ']',
    '',
  ].join('\n')
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  writeFileSync(join(ROOT, ROUTE_TABLE), routeTable())
  console.log(`${ROUTE_TABLE}: ${findRoutes().length} routes`)
}
