import { z } from 'zod'
import './plain-words'

/** The audit view: newest first, optionally one kind of record, one page at a time. */
export const auditEventQuerySchema = z.object({
  entity: z.enum(['worksheet', 'specification', 'tool', 'user', 'aircraft', 'accumulator', 'cycle-check', 'webhook', 'api-token']).optional(),
  page: z.coerce.number().int().min(1).max(100_000, 'At most page 100000.').default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
}).strict()

const day = (what: string) => z.string().date(`The ${what} date is a calendar date, like 2026-01-31.`)

/** The signed export: the whole chain, or a period's run of it (UTC days, both included; both ends or neither). */
export const auditExportQuerySchema = z
  .object({ from: day('first').optional(), to: day('last').optional() })
  .strict()
  .refine(query => (query.from === undefined) === (query.to === undefined), {
    message: 'Give both the first and the last date of the period, or neither for the whole trail.',
    path: ['to'],
  })
  .refine(query => !query.from || !query.to || query.to >= query.from, {
    message: 'The last date cannot come before the first.',
    path: ['to'],
  })
export type AuditExportQuery = z.infer<typeof auditExportQuerySchema>

const RECORD_KIND = z.enum(['worksheet', 'specification', 'tool', 'user', 'aircraft', 'accumulator', 'cycle-check'])
const REASON = z.string().trim().min(10, 'Say in at least 10 characters what you checked and why.').max(1000)

/** An administrator accepts a held record's current content, after checking it against the paper or a backup. */
export const auditAcceptSchema = z.object({
  entity: RECORD_KIND,
  entityId: z.coerce.number().int().min(1).transform(String),
  reason: REASON,
}).strict()
export type AuditAcceptBody = z.infer<typeof auditAcceptSchema>

/** An administrator re-anchors the chain's head at the entries that are there, after finding out why it broke. */
export const auditResolveHeadSchema = z.object({ reason: REASON }).strict()
export type AuditResolveHeadBody = z.infer<typeof auditResolveHeadSchema>
