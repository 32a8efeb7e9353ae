import type { ZodType, ZodTypeDef } from 'zod'
import { describeIssues, toFieldIssues, type FieldIssue } from '../../shared/schemas/issues'

/** Thrown by a validator; h3 turns it into a 400 whose `data` carries `issues`. */
class InputValidationError extends Error {
  readonly issues: FieldIssue[]
  constructor(issues: FieldIssue[]) {
    super(describeIssues(issues))
    this.issues = issues
  }
}

/**
 * A validator for `readValidatedBody`, `getValidatedQuery` and `getValidatedRouterParams`:
 * parses with the shared zod schema and answers bad input with 400, a message naming each
 * field, and `data.issues[]` of `{ path, field, message }`.
 */
export function validateWith<Output, Input>(schema: ZodType<Output, ZodTypeDef, Input>) {
  return (value: unknown): Output => {
    const parsed = schema.safeParse(value)
    if (parsed.success) return parsed.data
    throw new InputValidationError(toFieldIssues(parsed.error.issues))
  }
}
