import type { ZodType, ZodTypeDef } from 'zod'
import { isEngineInputError } from '../gas/errors'
import { describeIssues, toFieldIssues } from '../schemas/issues'

/** Why a calculation gave no figure, in the words the calculation API uses, with the input to change. */
export interface CalculationRefusal {
  message: string
  field: string | null
}

export type Calculated<Result>
  = | { result: Result, refusal?: undefined }
    | { result?: undefined, refusal: CalculationRefusal }

/**
 * A calculation as the API runs it, on whichever side calls it: the input checked with the route's own schema,
 * then the engine; input the schema refuses, or the engine finds physically impossible, is a refusal naming the
 * field (the engine's, else `fallbackField`) instead of a figure. The browser computes its instant and offline
 * figures this way; the server recomputes whatever it stores.
 */
export function calculate<Input, Body, Result>(
  schema: ZodType<Body, ZodTypeDef, Input>,
  input: Input,
  calculation: (body: Body) => Result,
  fallbackField?: string,
): Calculated<Result> {
  const parsed = schema.safeParse(input)
  if (!parsed.success) {
    const issues = toFieldIssues(parsed.error.issues)
    return { refusal: { message: describeIssues(issues), field: issues[0]?.field ?? null } }
  }
  try {
    return { result: calculation(parsed.data) }
  }
  catch (error) {
    if (!isEngineInputError(error)) throw error
    return { refusal: { message: error.message, field: error.field ?? fallbackField ?? null } }
  }
}
