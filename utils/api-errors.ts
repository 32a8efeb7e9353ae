import type { FieldIssue } from '#shared/schemas/issues'

interface ApiFailure {
  data?: { message?: string, data?: { issues?: FieldIssue[] } }
  message?: string
  statusCode?: number
}

/** The plain message of a failed API call. */
export function errorMessage(failure: unknown): string {
  const error = failure as ApiFailure
  if (error?.statusCode === undefined && error?.message?.includes('fetch'))
    return 'No connection to Chargewell. Check the network and try again; nothing you entered is lost.'
  return error?.data?.message ?? error?.message ?? 'Something went wrong.'
}

/** Field issues of a 400/422 answer, keyed by dotted path, for a form's setErrors. */
export function fieldErrors(failure: unknown): Record<string, string> {
  const issues = (failure as ApiFailure)?.data?.data?.issues ?? []
  return Object.fromEntries(issues.map(issue => [issue.field, issue.message]))
}

/** A 409: someone else changed the record first (or it is in a state that no longer allows this). */
export function isConflict(failure: unknown): boolean {
  return (failure as ApiFailure)?.statusCode === 409
}
