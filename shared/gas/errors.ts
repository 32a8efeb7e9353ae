/**
 * Input the engine cannot compute because it is physically impossible or outside the range
 * of the method (for example a minimum pressure above the maximum, or a temperature outside
 * the validated range of the equation of state). Routes answer it with 422.
 */
export class EngineInputError extends Error {
  /** Dotted path of the input that caused it, when one input can be named. */
  readonly field?: string

  constructor(message: string, field?: string) {
    super(message)
    this.name = 'EngineInputError'
    this.field = field
  }
}

export function isEngineInputError(error: unknown): error is EngineInputError {
  return error instanceof Error && error.name === 'EngineInputError'
}
