import { recordsArchiveQuerySchema } from '#shared/schemas/records-archive'
import { recordsArchive } from '../../services/records-archive'

/**
 * A period's released records as one ZIP, streamed: each record's PDF, the records and their signatures as
 * NDJSON, the signed audit export and a manifest of SHA-256 sums (for an auditor or a retention archive).
 */
export default defineEventHandler(async (event) => {
  const { user, scope } = await requireScope(event, 'audit.verify')
  const query = await getValidatedQuery(event, validateWith(recordsArchiveQuerySchema))
  const name = `chargewell-records-${query.from}-to-${query.to}${query.station ? `-${query.station.replace(/[^\w-]+/g, '_')}` : ''}.zip`
  setResponseHeader(event, 'content-type', 'application/zip')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}"`)
  setResponseHeader(event, 'cache-control', 'no-store')
  return sendStream(event, recordsArchive(event, user, query, scope))
})
