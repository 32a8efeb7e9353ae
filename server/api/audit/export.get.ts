import { Readable } from 'node:stream'
import { noQuerySchema } from '#shared/schemas/common'
import { signedExport } from '../../services/audit'

/**
 * The whole audit chain as signed newline-delimited JSON, streamed in batches. Check it offline
 * with `node scripts/check-audit-export.mjs <file> --key <fingerprint>`.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'audit.verify')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  const lines = signedExport(user)
  setResponseHeader(event, 'content-type', 'application/x-ndjson; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-audit-${stationToday()}.ndjson"`)
  return sendStream(event, Readable.from(lines))
})
