import type { SchemaLike } from './json-schema-words'

/** One operation of the OpenAPI description, as the reference page reads it. */
export interface ApiReferenceOperation {
  summary: string
  description: string
  tags?: string[]
  parameters?: { name: string, in: string, required?: boolean, schema?: SchemaLike }[]
  requestBody?: { content: Record<string, { schema?: SchemaLike, example?: unknown }> }
  responses: Record<string, { description: string }>
}

export interface ApiReferenceDocument {
  info: { title: string, version: string, description: string }
  paths: Record<string, Record<string, ApiReferenceOperation>>
}
