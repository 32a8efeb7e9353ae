import type { ZodTypeAny } from 'zod'
import type { Ability } from '../../shared/abilities'

/** One route under server/api, as scripts/openapi-routes.ts reads it from its file. */
export interface ApiRoute {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  /** In OpenAPI's form: `/api/worksheets/{id}/sign`. */
  path: string
  file: string
  summary: string
  description: string
  /** The ability it asks for (shared/abilities.ts), or `public`. */
  access: Ability | 'public'
  /** Its answer's status when all goes well. */
  status: number
  params: ZodTypeAny | undefined
  query: ZodTypeAny | undefined
  body: ZodTypeAny | undefined
  /** The body's type when it is not JSON (a CSV import, a PDF, a multipart upload). */
  requestType?: string
  responseType: string
}
