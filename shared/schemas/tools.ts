import { z } from 'zod'
import { TOOL_KINDS } from '../types/registers'
import { booleanQuery, isoDate, registerQuery, text } from './common'
import { pressureUnitSchema } from './quantities'

/** Gauges and nitrogen carts. */
export const toolSchema = z
  .object({
    kind: z.enum(TOOL_KINDS, { errorMap: () => ({ message: 'The kind is gauge or cart.' }) }),
    assetNumber: text('asset number', 40),
    description: text('description', 160),
    rangeMax: z.number().positive().nullable().default(null),
    rangeUnit: pressureUnitSchema.nullable().default(null),
    resolution: z.number().positive().nullable().default(null),
    accuracy: z.number().positive().nullable().default(null),
    accuracyUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%FS']).nullable().default(null),
    calibrationDue: isoDate.nullable().default(null),
    active: z.boolean().default(true),
  })
  .strict()
  .superRefine((tool, context) => {
    if (tool.kind === 'gauge') {
      if (!tool.rangeMax || !tool.rangeUnit)
        context.addIssue({ code: 'custom', path: ['rangeMax'], message: 'A gauge needs its range.' })
      if (!tool.accuracy || !tool.accuracyUnit)
        context.addIssue({ code: 'custom', path: ['accuracy'], message: 'A gauge needs its accuracy.' })
    }
  })
export type ToolBody = z.infer<typeof toolSchema>

export const toolUpdateSchema = z
  .object({
    description: text('description', 160).optional(),
    rangeMax: z.number().positive().nullable().optional(),
    rangeUnit: pressureUnitSchema.nullable().optional(),
    resolution: z.number().positive().nullable().optional(),
    accuracy: z.number().positive().nullable().optional(),
    accuracyUnit: z.enum(['psi', 'bar', 'kPa', 'MPa', '%FS']).nullable().optional(),
    calibrationDue: isoDate.nullable().optional(),
    active: z.boolean().optional(),
  })
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')
export const toolQuerySchema = z.object({
  ...registerQuery,
  kind: z.enum(TOOL_KINDS).optional(),
  calibration: z.enum(['expired', 'valid']).optional(),
  active: booleanQuery,
  sort: z.enum(['assetNumber', 'kind', 'calibrationDue', 'description']).default('assetNumber'),
})
