import type { FieldIssue } from '#shared/schemas/issues'

interface ApiFailure {
  data?: { message?: string, data?: { issues?: FieldIssue[] } }
  message?: string
  statusCode?: number
}

/** The browser's words for a request that got no answer at all, wherever they end up (useFetch wraps them as a 500). */
const NO_ANSWER = /<no response>|Failed to fetch|NetworkError|Load failed|fetch failed/

/** A request that got no answer: no network, or the server out of reach. */
export function isNoAnswer(failure: unknown): boolean {
  const error = failure as ApiFailure
  return NO_ANSWER.test(error?.message ?? '') || (error?.statusCode === undefined && !!error?.message?.includes('fetch'))
}

/** The plain message of a failed API call; never the browser's fetch text. */
export function errorMessage(failure: unknown): string {
  const error = failure as ApiFailure
  if (isNoAnswer(failure))
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
