import { createHash, randomUUID } from 'node:crypto'
import { z } from 'zod'
import { canEdit } from '../../../shared/utils/worksheet-rules'
import { appendAudit } from '../../database/audit-chain'
import { Attachment } from '../../models'

const fieldsSchema = z.object({
  worksheetId: z.coerce.number({ invalid_type_error: 'Say which worksheet the file belongs to.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
  kind: z.enum(['gauge-photo', 'certificate', 'other'], { errorMap: () => ({ message: 'The kind is gauge-photo, certificate or other.' }) }),
})

/**
 * Uploads a gauge photo or certificate for a worksheet being filled: images (JPEG, PNG, WebP)
 * and PDFs only, recognised by their content, not their name; at most NUXT_UPLOAD_MAX_BYTES.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const parts = await readMultipartFormData(event)
  if (!parts) throw createError({ status: 400, statusMessage: 'Bad Request', message: 'Send the file as multipart/form-data with the fields worksheetId, kind and file.' })
  const text = (name: string) => parts.find(part => part.name === name && !part.filename)?.data.toString('utf8')
  const fields = parseInput(fieldsSchema, { worksheetId: text('worksheetId'), kind: text('kind') })
  const file = parts.find(part => part.name === 'file' && part.filename)
  if (!file) throw createError({ status: 400, statusMessage: 'Bad Request', message: 'Attach the file in the field "file".', data: { issues: [{ path: ['file'], field: 'file', message: 'No file.' }] } })
  const { uploadMaxBytes } = useRuntimeConfig()
  if (file.data.length > Number(uploadMaxBytes)) {
    throw createError({ status: 413, statusMessage: 'Payload Too Large', message: `The file is ${(file.data.length / 1048576).toFixed(1)} MB; the limit is ${(Number(uploadMaxBytes) / 1048576).toFixed(0)} MB.` })
  }
  const mimeType = detectFileType(file.data)
  if (!mimeType) throw createError({ status: 415, statusMessage: 'Unsupported Media Type', message: 'Only photos (JPEG, PNG, WebP) and PDF documents can be attached; this file is neither, whatever its name says.' })
  const worksheet = await findWorksheet(fields.worksheetId)
  enforce(canEdit(user, worksheet))
  const storageKey = `${worksheet.id}/${randomUUID()}`
  await useStorage('uploads').setItemRaw(storageKey, file.data)
  const sha256 = createHash('sha256').update(file.data).digest('hex')
  const attachment = await writeTransaction(async (transaction) => {
    // Still the performer's open worksheet now that it is our turn to write.
    enforce(canEdit(user, await findWorksheet(worksheet.id, transaction)))
    const created = await Attachment.create({
      worksheetId: worksheet.id, kind: fields.kind, originalName: (file.filename ?? 'file').slice(0, 200), mimeType, sizeBytes: file.data.length, storageKey, uploadedById: user.id, sha256,
    }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'worksheet', entityId: String(worksheet.id), action: 'attachment-added', detail: { attachmentId: created.id, kind: fields.kind, sha256 } }, transaction)
    return created
  })
  setResponseStatus(event, 201)
  return { id: attachment.id, kind: attachment.kind, originalName: attachment.originalName, mimeType, sizeBytes: attachment.sizeBytes }
})
