import { isEngineInputError } from '#shared/gas/errors'

/**
 * Runs an engine calculation; physically impossible input (the engine's EngineInputError)
 * becomes 422 with the engine's plain explanation and the field it names (or the route's
 * `fallbackField`, so every 422 points at something the caller can change).
 */
export function runEngine<T>(calculation: () => T, fallbackField?: string): T {
  try {
    return calculation()
  }
  catch (error) {
    if (isEngineInputError(error)) {
      // A refusal deep in the equation of state knows no request field: the route names the input to change.
      const field = error.field ?? fallbackField
      throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: error.message, data: { field, issues: field ? [{ path: field.split('.'), field, message: error.message }] : [] } })
    }
    throw error
  }
}
