import { Readable } from 'node:stream'
import { auditExportQuerySchema } from '#shared/schemas/audit'
import { signedExport } from '../../services/audit'

/**
 * The audit chain as signed newline-delimited JSON, streamed in batches: the whole chain, or with `from` and
 * `to` (UTC days, both included) the period's unbroken run of it, anchored on the entry before it. Check it
 * offline with `node scripts/check-audit-export.mjs <file> --key <fingerprint>`.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'audit.verify')
  const query = await getValidatedQuery(event, validateWith(auditExportQuerySchema))
  const period = query.from && query.to ? { from: query.from, to: query.to } : undefined
  const lines = signedExport(user, period)
  const name = period ? `chargewell-audit-${period.from}-to-${period.to}` : `chargewell-audit-${stationToday()}`
  setResponseHeader(event, 'content-type', 'application/x-ndjson; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}.ndjson"`)
  return sendStream(event, Readable.from(lines))
})
