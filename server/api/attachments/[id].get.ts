import { idParamsSchema } from '#shared/schemas/common'
import { readAttachment } from '../../services/attachments'

/** Serves an attachment to signed-in users only (the files are not under public/), checked against its fingerprint. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'worksheet.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { attachment, data } = await readAttachment(id, scope)
  setResponseHeader(event, 'content-type', attachment.mimeType)
  setResponseHeader(event, 'content-disposition', `inline; filename="${attachment.originalName.replace(/[^\w.-]+/g, '_')}"`)
  setResponseHeader(event, 'cache-control', 'private, max-age=300')
  return data
})
