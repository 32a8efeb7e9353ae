/** A JSON Schema (as the OpenAPI description holds it), loosely: what the reference page reads of it. */
export interface SchemaLike {
  type?: string | string[]
  enum?: unknown[]
  const?: unknown
  properties?: Record<string, SchemaLike>
  required?: string[]
  items?: SchemaLike
  anyOf?: SchemaLike[]
  oneOf?: SchemaLike[]
  allOf?: SchemaLike[]
  format?: string
  minimum?: number
  maximum?: number
  default?: unknown
  description?: string
}

/** A schema in a few words: `psi | bar | kPa | MPa`, `{ value, unit, basis }`, `string[]`, `number ≥ 0`. */
export function schemaWords(schema: SchemaLike | undefined, depth = 0): string {
  if (!schema) return 'any'
  if (schema.const !== undefined) return JSON.stringify(schema.const)
  if (schema.enum) return schema.enum.map(value => JSON.stringify(value).replace(/^"|"$/g, '')).join(' | ')
  const choices = schema.anyOf ?? schema.oneOf
  if (choices) return choices.map(choice => schemaWords(choice, depth + 1)).join(' or ')
  if (schema.allOf?.length) return schema.allOf.map(part => schemaWords(part, depth + 1)).join(' and ')
  const type = Array.isArray(schema.type) ? schema.type.filter(kind => kind !== 'null').join(' | ') : schema.type
  if (type === 'array') return `${schemaWords(schema.items, depth + 1)}[]`
  if (type === 'object' && schema.properties) {
    const keys = Object.keys(schema.properties)
    return depth > 1 ? 'object' : `{ ${keys.join(', ')} }`
  }
  const bounds = [
    schema.minimum !== undefined ? `≥ ${schema.minimum}` : '',
    schema.maximum !== undefined ? `≤ ${schema.maximum}` : '',
  ].filter(Boolean).join(', ')
  const nullable = Array.isArray(schema.type) && schema.type.includes('null') ? ' or null' : ''
  return `${schema.format ? `${type} (${schema.format})` : type ?? 'any'}${bounds ? ` ${bounds}` : ''}${nullable}`
}

/** The fields of an object schema, each with its words and whether it must be given. */
export function schemaFields(schema: SchemaLike | undefined): { name: string, words: string, required: boolean }[] {
  if (!schema?.properties) return []
  return Object.entries(schema.properties).map(([name, field]) => ({
    name,
    words: schemaWords(field),
    required: schema.required?.includes(name) ?? false,
  }))
}
