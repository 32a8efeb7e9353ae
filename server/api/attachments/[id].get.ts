import { idParamsSchema } from '../../../shared/schemas/auth'
import { Attachment } from '../../models'

/** Serves an attachment to signed-in users only (the files are not under public/). */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const attachment = await Attachment.findByPk(id)
  if (!attachment) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Attachment not found.' })
  const data = await useStorage('uploads').getItemRaw<Buffer>(attachment.storageKey)
  if (!data) throw createError({ status: 404, statusMessage: 'Not Found', message: 'The stored file is missing; tell an administrator.' })
  setResponseHeader(event, 'content-type', attachment.mimeType)
  setResponseHeader(event, 'content-disposition', `inline; filename="${attachment.originalName.replace(/[^\w.-]+/g, '_')}"`)
  setResponseHeader(event, 'x-content-type-options', 'nosniff')
  setResponseHeader(event, 'cache-control', 'private, max-age=300')
  return data
})
