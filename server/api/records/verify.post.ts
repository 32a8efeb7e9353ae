import { verifyRecordPdf } from '#shared/utils/record-verify'

/**
 * Verifies a record PDF (at most 40 MB, server/middleware/0.body-limit.ts): the same checks as
 * `npm run verify-record`, on the file alone (no database is read, nothing is kept). Open to anyone
 * holding a record (an auditor need not have an account); the answer says only what the file proves.
 */
export default defineEventHandler(async (event) => {
  const body = await readRawBody(event, false)
  if (!body?.length)
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'Drop a record PDF to verify.', data: { field: 'file' } })
  setResponseHeader(event, 'cache-control', 'no-store')
  return verifyRecordPdf(new Uint8Array(body))
})
