/**
 * The OpenAPI description cannot drift from the routes: the route table is read again from the files under
 * server/api and must equal the committed one (a route added, removed, or validating with another schema
 * fails here until `npm run openapi:routes` is run); every route file is an operation of the document; every
 * route that takes JSON has an example, and every example parses with the route's own schema. The document is
 * checked against the OpenAPI 3.1 JSON Schema by @seriousme/openapi-schema-validator (an outside validator).
 */
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { Validator } from '@seriousme/openapi-schema-validator'
import { describe, expect, it } from 'vitest'
import { ROUTE_TABLE, routeOfFile, routeTable } from '../../scripts/openapi-routes'
import { buildOpenApiDocument, invalidExamples } from '../../server/openapi/document'
import { REQUEST_EXAMPLES } from '../../server/openapi/examples'
import { API_ROUTES } from '../../server/openapi/routes'

const ROOT = join(import.meta.dirname, '../..')
const filesUnder = (folder: string): string[] => readdirSync(folder, { withFileTypes: true })
  .flatMap(entry => (entry.isDirectory() ? filesUnder(join(folder, entry.name)) : [join(folder, entry.name)]))

describe('the OpenAPI description', () => {
  it('is written from the route files as they are now (run `npm run openapi:routes` after changing a route)', () => {
    expect(readFileSync(join(ROOT, ROUTE_TABLE), 'utf8')).toBe(routeTable())
  })

  it('has an operation for every file under server/api, and none besides', () => {
    const document = buildOpenApiDocument()
    const operations = Object.entries(document.paths ?? {}).flatMap(([path, item]) =>
      Object.keys(item as object).filter(key => ['get', 'post', 'put', 'patch', 'delete'].includes(key)).map(method => `${method.toUpperCase()} ${path}`))
    const files = filesUnder(join(ROOT, 'server/api')).map((file) => {
      const { method, route } = routeOfFile(file)
      return `${method} ${route.replace(/\[(\w+)\]/g, '{$1}')}`
    })
    expect(files.length).toBeGreaterThan(120)
    expect(operations.sort()).toEqual(files.sort())
  })

  it('gives an example for every JSON body, and each example parses with its route\'s schema', () => {
    const missing = API_ROUTES
      .filter(route => route.body && !route.requestType)
      .map(route => `${route.method.toUpperCase()} ${route.path}`)
      .filter(key => !(key in REQUEST_EXAMPLES))
    expect(missing).toEqual([])
    expect(invalidExamples()).toEqual([])
    // And an example that does not parse is caught: the check is not vacuous.
    const [key] = Object.keys(REQUEST_EXAMPLES)
    const schema = API_ROUTES.find(route => `${route.method.toUpperCase()} ${route.path}` === key)!.body!
    expect(schema.safeParse({ unexpected: true }).success).toBe(false)
  })

  it('is a valid OpenAPI 3.1 document, and says who may call each route', async () => {
    const document = buildOpenApiDocument()
    const validator = new Validator()
    const result = await validator.validate(document as unknown as Parameters<Validator['validate']>[0])
    expect(result.errors ?? []).toEqual([])
    expect(result.valid).toBe(true)
    expect(validator.version).toBe('3.1')
    const sign = document.paths!['/api/worksheets/{id}/sign']!.post!
    expect(sign.description).toContain('Needs the technician role')
    expect(sign.security).toEqual([{ session: [] }])
    const calc = document.paths!['/api/calc/charge-target']!.post!
    expect(calc.security).toEqual([{ session: [] }, { apiToken: ['calculations'] }])
    expect((calc.requestBody as { content: Record<string, { example?: unknown }> }).content['application/json']!.example)
      .toEqual(REQUEST_EXAMPLES['POST /api/calc/charge-target'])
  })
})
