import type { ZodIssue } from 'zod'

/** One offending field, as the API reports it and the forms map back onto their inputs. */
export interface FieldIssue {
  path: (string | number)[]
  /** The path joined with dots, e.g. `reference.pressure.value`. */
  field: string
  message: string
}

export function toFieldIssues(issues: ZodIssue[]): FieldIssue[] {
  return issues.map(issue => ({ path: issue.path, field: issue.path.join('.') || '(body)', message: issue.message }))
}

export function describeIssues(issues: FieldIssue[]): string {
  if (issues.length === 0) return 'The input is not valid.'
  return `Please check: ${issues.map(issue => `${issue.field} — ${issue.message}`).join('; ')}`
}
