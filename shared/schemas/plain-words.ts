import { z, type ZodErrorMap, type ZodType, type ZodTypeDef } from 'zod'

/**
 * zod's own messages ("Expected number, received nan", "Number must be greater than or equal
 * to 0") in words a mechanic reads at a glance. Messages a schema gives itself still win; this
 * is only what is said where a schema says nothing. Installed once for pages and server alike
 * (every schema module imports this one).
 */
const plainWords: ZodErrorMap = (issue, context) => {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.received === 'undefined' || issue.received === 'null') return { message: 'Required: enter a value.' }
      if (issue.received === 'nan' || issue.expected === 'number') return { message: 'Enter a number (this is not one).' }
      if (issue.expected === 'boolean') return { message: 'Yes or no (true or false).' }
      if (issue.expected === 'string') return { message: 'Enter text.' }
      break
    case 'not_finite':
      return { message: 'Enter an ordinary number.' }
    case 'invalid_enum_value':
      return { message: `One of: ${issue.options.join(', ')}.` }
    case 'invalid_string':
      if (issue.validation === 'date') return { message: 'Use a date like 2026-01-31.' }
      if (issue.validation === 'email') return { message: 'Enter an e-mail address like name@example.org.' }
      break
    case 'too_small':
      if (issue.type === 'string') return { message: issue.minimum === 1 ? 'Enter a value.' : `At least ${issue.minimum} characters.` }
      if (issue.type === 'number') return { message: issue.inclusive ? `At least ${issue.minimum}.` : `Above ${issue.minimum}.` }
      if (issue.type === 'array') return { message: `At least ${issue.minimum} entries.` }
      break
    case 'too_big':
      if (issue.type === 'string') return { message: `At most ${issue.maximum} characters.` }
      if (issue.type === 'number') return { message: issue.inclusive ? `At most ${issue.maximum}.` : `Below ${issue.maximum}.` }
      if (issue.type === 'array') return { message: `At most ${issue.maximum} entries.` }
      break
    case 'invalid_literal':
      return { message: `Must be ${JSON.stringify(issue.expected)}.` }
  }
  if (issue.code === 'invalid_type' && issue.expected === 'integer') return { message: 'A whole number, please.' }
  return { message: context.defaultError }
}
z.setErrorMap(plainWords)

/**
 * A CSV row checked column by column: every cell that cannot be read is reported, and every
 * rule of the target schema that the readable cells break — all problems of a row at once, not
 * only the first stage's (a plain `.pipe` stops at the first failing stage).
 */
export function csvRow<Output>(cells: z.ZodRawShape, target: ZodType<Output, ZodTypeDef, unknown>) {
  return z.record(z.string(), z.unknown()).transform((raw, context): Output => {
    const readable: Record<string, unknown> = {}
    const unreadable = new Set<string>()
    for (const [column, schema] of Object.entries(cells)) {
      const cell = schema.safeParse(raw[column])
      if (cell.success) {
        if (cell.data !== undefined) readable[column] = cell.data
        continue
      }
      unreadable.add(column)
      for (const issue of cell.error.issues) context.addIssue({ ...issue, path: [column, ...issue.path] })
    }
    const checked = target.safeParse(readable)
    if (!checked.success) {
      for (const issue of checked.error.issues) if (!unreadable.has(String(issue.path[0]))) context.addIssue(issue)
      return z.NEVER
    }
    return unreadable.size ? z.NEVER : checked.data
  })
}
