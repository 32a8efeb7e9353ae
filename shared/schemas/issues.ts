import type { ZodIssue } from 'zod'

/** One offending field, as the API reports it and the forms map back onto their inputs. */
export interface FieldIssue {
  path: (string | number)[]
  /** The path joined with dots, e.g. `reference.pressure.value`. */
  field: string
  message: string
}

export function toFieldIssues(issues: ZodIssue[]): FieldIssue[] {
  return issues.flatMap((issue): FieldIssue[] => {
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map(key => ({ path: [...issue.path, key], field: [...issue.path, key].join('.'), message: 'Not a field of this request (check the spelling).' }))
    }
    const missingBody = issue.path.length === 0 && issue.code === 'invalid_type' && issue.received === 'undefined'
    return [{ path: issue.path, field: issue.path.join('.') || '(body)', message: missingBody ? 'The request needs a JSON body.' : issue.message }]
  })
}

export function describeIssues(issues: FieldIssue[]): string {
  if (issues.length === 0) return 'The input is not valid.'
  return `Please check: ${issues.map(issue => `${issue.field} — ${issue.message}`).join('; ')}`
}
