import { H3Error } from 'h3'
import type { ZodType, ZodTypeDef } from 'zod'
import { describeIssues, toFieldIssues, type FieldIssue } from '#shared/schemas/issues'

/**
 * Bad input: 400 with a message naming each field and `data.issues[]` of `{ path, field, message }`.
 * Thrown directly it is an ordinary h3 error; h3's validators wrap it and put it in `data`,
 * where it serialises with its `issues` — the same answer either way, never a 500.
 */
class InputValidationError extends H3Error<{ issues: FieldIssue[] }> {
  readonly issues: FieldIssue[]
  constructor(issues: FieldIssue[]) {
    super(describeIssues(issues))
    this.issues = issues
    this.statusCode = 400
    this.statusMessage = 'Bad Request'
    this.data = { issues }
  }

  override toJSON() {
    const json = { message: this.message, statusCode: this.statusCode, issues: this.issues }
    return json
  }
}

/**
 * Where a value holds a number JSON should not carry (`1e999` parses as Infinity): such
 * numbers are refused before any schema sees them, whatever the schema says.
 */
function nonFiniteNumbers(value: unknown, path: (string | number)[] = [], found: FieldIssue[] = []): FieldIssue[] {
  if (typeof value === 'number' && !Number.isFinite(value)) {
    found.push({ path, field: path.join('.') || '(body)', message: 'Must be an ordinary finite number.' })
  }
  else if (value && typeof value === 'object' && found.length < 20) {
    for (const [key, item] of Object.entries(value))
      nonFiniteNumbers(item, [...path, Array.isArray(value) ? Number(key) : key], found)
  }
  return found
}

/** Parses with the shared zod schema, or throws the 400 described above. */
export function parseInput<Output, Input>(schema: ZodType<Output, ZodTypeDef, Input>, value: unknown): Output {
  const nonFinite = nonFiniteNumbers(value)
  if (nonFinite.length) throw new InputValidationError(nonFinite)
  const parsed = schema.safeParse(value)
  if (parsed.success) return parsed.data
  throw new InputValidationError(toFieldIssues(parsed.error.issues))
}

/** A validator for `readValidatedBody`, `getValidatedQuery` and `getValidatedRouterParams`. */
export function validateWith<Output, Input>(schema: ZodType<Output, ZodTypeDef, Input>) {
  return (value: unknown): Output => parseInput(schema, value)
}
