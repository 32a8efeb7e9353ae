import { Readable } from 'node:stream'
import { noQuerySchema } from '#shared/schemas/common'
import { auditSigningKey } from '../../database/audit-chain'
import { signedExport } from '../../services/audit'

/**
 * The whole audit chain as signed newline-delimited JSON, streamed in batches. Check it offline
 * with `node scripts/check-audit-export.mjs <file> --key <fingerprint>`.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'audit.verify')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  if (!auditSigningKey()) throw createError({ status: 503, statusMessage: 'Service Unavailable', message: 'No audit secret is configured, so the export cannot be signed.' })
  setResponseHeader(event, 'content-type', 'application/x-ndjson; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-audit-${stationToday()}.ndjson"`)
  return sendStream(event, Readable.from(signedExport(user)))
})
