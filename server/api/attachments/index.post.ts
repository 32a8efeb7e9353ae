import { attachmentFieldsSchema } from '#shared/schemas/attachment'
import { attachFile } from '../../services/attachments'

/**
 * Uploads a gauge photo or certificate for a worksheet being filled, or replaces one: images
 * (JPEG, PNG, WebP) and PDFs only, recognised by their content, not their name; at most
 * NUXT_UPLOAD_MAX_BYTES. The form's fields are validated like any body.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const parts = await readMultipartFormData(event)
  if (!parts) throw createError({ status: 400, statusMessage: 'Bad Request', message: 'Send the file as multipart/form-data with the fields worksheetId, kind and file.' })
  const text = (name: string) => parts.find(part => part.name === name && !part.filename)?.data.toString('utf8')
  const { fileName, ...fields } = parseInput(attachmentFieldsSchema, { worksheetId: text('worksheetId'), kind: text('kind'), replacesId: text('replacesId') || undefined, fileName: text('fileName') })
  const file = parts.find(part => part.name === 'file' && (part.filename !== undefined || fileName))
  setResponseStatus(event, 201)
  return attachFile(user, { ...fields, file: file ? { name: fileName ?? file.filename ?? 'file', data: file.data } : undefined })
})
