import { createHash } from 'node:crypto'
import { idParamsSchema } from '../../../shared/schemas/auth'
import { Attachment } from '../../models'

/** Serves an attachment to signed-in users only (the files are not under public/). */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const attachment = await Attachment.findByPk(id)
  if (!attachment) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Attachment not found.' })
  const stored = await useStorage('uploads').getItemRaw<Buffer | ArrayBuffer | Uint8Array>(attachment.storageKey)
  if (!stored) throw createError({ status: 404, statusMessage: 'Not Found', message: 'The stored file is missing; tell an administrator.' })
  // The file system gives a Buffer, a bucket an ArrayBuffer.
  const data = Buffer.from(stored instanceof ArrayBuffer ? new Uint8Array(stored) : stored)
  // The bytes must be the ones uploaded (their SHA-256 is part of the worksheet's audited record).
  if (attachment.sha256 && createHash('sha256').update(data).digest('hex') !== attachment.sha256) {
    throw createError({ status: 409, statusMessage: 'Conflict', message: 'The stored file is not the one that was uploaded (its fingerprint differs); it was not served. Tell an administrator.' })
  }
  setResponseHeader(event, 'content-type', attachment.mimeType)
  setResponseHeader(event, 'content-disposition', `inline; filename="${attachment.originalName.replace(/[^\w.-]+/g, '_')}"`)
  setResponseHeader(event, 'x-content-type-options', 'nosniff')
  setResponseHeader(event, 'cache-control', 'private, max-age=300')
  return data
})
