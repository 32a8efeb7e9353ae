import { noQuerySchema } from '#shared/schemas/common'
import { buildOpenApiDocument, type OpenApiDocument } from '../openapi/document'

let described: OpenApiDocument | undefined

/**
 * The OpenAPI 3.1 description of every route, built from the shared zod schemas the routes validate with:
 * what each takes, who may call it (role, and the API token scope that opens it), what it answers, and an
 * example body. Open to anyone, like the reference page that reads it; it holds no data.
 */
export default defineEventHandler(async (event) => {
  await getValidatedQuery(event, validateWith(noQuerySchema))
  described ??= buildOpenApiDocument(publicAddress(event))
  setResponseHeader(event, 'cache-control', 'public, max-age=300')
  return described
})
