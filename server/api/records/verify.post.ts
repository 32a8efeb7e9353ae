import { verifyRecordPdf } from '#shared/utils/record-verify'

const MAX_BYTES = 40 * 1024 * 1024

/**
 * Verifies a record PDF dropped on the verify page: the same checks as `npm run verify-record`, on
 * the file alone (no database is read, nothing is kept). Open to anyone holding a record (an auditor
 * need not have an account); the answer says only what the file itself proves.
 */
export default defineEventHandler(async (event) => {
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (length > MAX_BYTES)
    throw createError({ status: 413, statusMessage: 'Payload Too Large', message: 'A record PDF is at most 40 MB.', data: { field: 'file' } })
  const body = await readRawBody(event, false)
  if (!body?.length)
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'Drop a record PDF to verify.', data: { field: 'file' } })
  setResponseHeader(event, 'cache-control', 'no-store')
  return verifyRecordPdf(new Uint8Array(body))
})
