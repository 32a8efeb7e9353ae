import { isEngineInputError } from '#shared/gas/errors'

/**
 * Runs an engine calculation; physically impossible input (the engine's EngineInputError)
 * becomes 422 with the engine's plain explanation and the field it names.
 */
export function runEngine<T>(calculation: () => T): T {
  try {
    return calculation()
  }
  catch (error) {
    if (isEngineInputError(error)) {
      throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: error.message, data: { field: error.field, issues: error.field ? [{ path: error.field.split('.'), field: error.field, message: error.message }] : [] } })
    }
    throw error
  }
}
