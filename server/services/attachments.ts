import { createHash, randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import { canEdit } from '#shared/utils/worksheet-rules'
import { appendAudit } from '../database/audit-chain'
import type { WorksheetDto } from '#shared/types/worksheet'
import { Attachment, type User } from '../models'
import { WHOLE_ORGANISATION, type Scope } from './scope'
import { enforce, findWorksheet, requireWorksheetInScope, worksheetById } from './worksheets'

/**
 * Gauge photos and certificates on a worksheet being filled. Only the performer, only while the
 * worksheet is open: once signed, its attachments are part of the record and never change.
 * The bytes are stored first (by a key no one else uses), then the row and its audit entry are
 * written in one transaction; a replaced or removed file's row goes, its fingerprint stays in
 * the audit trail.
 */

export interface NewAttachment {
  worksheetId: number
  kind: string
  replacesId?: number
  file?: { name: string, data: Buffer }
}

function tooLarge(bytes: number): never {
  const limit = Number(useRuntimeConfig().uploadMaxBytes)
  throw createError({
    status: 413,
    statusMessage: 'Payload Too Large',
    message: `The file is ${(bytes / 1048576).toFixed(1)} MB; the limit is ${(limit / 1048576).toFixed(0)} MB.`,
  })
}

export async function attachFile(actor: User, upload: NewAttachment) {
  const { file } = upload
  if (!file) {
    throw createError({
      status: 400, statusMessage: 'Bad Request', message: 'Attach the file in the field "file".',
      data: { issues: [{ path: ['file'], field: 'file', message: 'No file.' }] },
    })
  }
  if (file.data.length > Number(useRuntimeConfig().uploadMaxBytes)) tooLarge(file.data.length)
  const mimeType = detectFileType(file.data)
  if (!mimeType)
    throw createError({
      status: 415,
      statusMessage: 'Unsupported Media Type',
      message:
        'Only photos (JPEG, PNG, WebP) and PDF documents can be attached; this file is neither, whatever its name says.',
    })
  await requireWorksheetInScope(actor, upload.worksheetId)
  const worksheet = await findWorksheet(upload.worksheetId)
  enforce(canEdit(actor, worksheet))
  const storageKey = `${worksheet.id}/${randomUUID()}`
  await useStorage('uploads').setItemRaw(storageKey, file.data)
  const sha256 = createHash('sha256').update(file.data).digest('hex')
  const attachment = await writeTransaction(async (transaction) => {
    // Still the performer's open worksheet now that it is our turn to write.
    enforce(canEdit(actor, await findWorksheet(worksheet.id, transaction)))
    const replaced = upload.replacesId ? await ownAttachment(worksheet.id, upload.replacesId, transaction) : null
    const created = await Attachment.create(
      {
        worksheetId: worksheet.id,
        kind: upload.kind,
        originalName: file.name.slice(0, 200),
        mimeType,
        sizeBytes: file.data.length,
        storageKey,
        uploadedById: actor.id,
        sha256,
      },
      { transaction },
    )
    if (replaced) await replaced.destroy({ transaction })
    await appendAudit(
      {
        actorId: actor.id,
        entity: 'worksheet',
        entityId: String(worksheet.id),
        action: replaced ? 'attachment-replaced' : 'attachment-added',
        detail: {
          attachmentId: created.id,
          kind: upload.kind,
          sha256,
          ...(replaced ? { replacedId: replaced.id, replacedSha256: replaced.sha256 } : {}),
        },
      },
      transaction,
    )
    return { created, replacedKey: replaced?.storageKey }
  })
  if (attachment.replacedKey) await useStorage('uploads').removeItem(attachment.replacedKey)
  const { created } = attachment
  return {
    id: created.id,
    kind: created.kind,
    originalName: created.originalName,
    mimeType,
    sizeBytes: created.sizeBytes,
  }
}

async function ownAttachment(worksheetId: number, id: number, transaction?: Transaction) {
  const attachment = await Attachment.findByPk(id, { transaction })
  if (!attachment || attachment.worksheetId !== worksheetId) {
    throw createError({
      status: 404,
      statusMessage: 'Not Found',
      message: 'That attachment is not on this worksheet.',
      data: {
        issues: [{ path: ['replacesId'], field: 'replacesId', message: 'Not an attachment of this worksheet.' }],
      },
    })
  }
  return attachment
}

/**
 * An attachment's bytes, only if they are the ones uploaded (their SHA-256 is part of the worksheet's audited
 * record).
 */
export async function readAttachment(
  id: number,
  scope: Scope = WHOLE_ORGANISATION,
): Promise<{ attachment: Attachment, data: Buffer }> {
  const attachment = await Attachment.findByPk(id)
  if (!attachment) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Attachment not found.' })
  // A worksheet's photo is seen by whoever may see the worksheet (server/services/scope.ts).
  if (attachment.worksheetId) {
    await requireWorksheetInScope(scope, attachment.worksheetId).catch(() => {
      throw createError({ status: 404, statusMessage: 'Not Found', message: 'Attachment not found.' })
    })
  }
  const stored = await useStorage('uploads').getItemRaw<Buffer | ArrayBuffer | Uint8Array>(attachment.storageKey)
  if (!stored)
    throw createError({
      status: 404,
      statusMessage: 'Not Found',
      message: 'The stored file is missing; tell an administrator.',
    })
  // The file system gives a Buffer, a bucket an ArrayBuffer.
  const data = Buffer.from(stored instanceof ArrayBuffer ? new Uint8Array(stored) : stored)
  if (attachment.sha256 && createHash('sha256').update(data).digest('hex') !== attachment.sha256) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message:
        'The stored file is not the one that was uploaded (its fingerprint differs); it was not served. Tell an administrator.',
    })
  }
  return { attachment, data }
}

/**
 * Removes a file from a worksheet still being filled (a blurred photo, the wrong certificate); answers the
 * worksheet.
 */
export async function removeAttachment(actor: User, id: number): Promise<WorksheetDto> {
  const found = await Attachment.findByPk(id)
  if (!found?.worksheetId)
    throw createError({ status: 404, statusMessage: 'Not Found', message: 'Attachment not found.' })
  const worksheetId = found.worksheetId
  await requireWorksheetInScope(actor, worksheetId)
  const storageKey = await writeTransaction(async (transaction) => {
    enforce(canEdit(actor, await findWorksheet(worksheetId, transaction)))
    const attachment = await ownAttachment(worksheetId, id, transaction)
    await attachment.destroy({ transaction })
    await appendAudit(
      {
        actorId: actor.id,
        entity: 'worksheet',
        entityId: String(worksheetId),
        action: 'attachment-removed',
        detail: { attachmentId: id, sha256: attachment.sha256 },
      },
      transaction,
    )
    return attachment.storageKey
  })
  await useStorage('uploads').removeItem(storageKey)
  return worksheetById(worksheetId)
}
