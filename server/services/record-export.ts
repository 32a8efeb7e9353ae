import type { H3Event } from 'h3'
import type { EmbeddedRecord, EmbeddedSignatures } from '#shared/types/record-proof'
import type { Passkey, Signature } from '../models'
import { contentHashOf, fieldDigests, keyFingerprint, signedRecordOf } from '#shared/utils/record-proof'
import { worksheetPdf } from '../utils/worksheet-pdf'
import { readAttachment } from './attachments'
import { Aircraft } from '../models'
import { operatorNames } from './aircraft'
import { stationNamed, type Scope } from './scope'
import { findWorksheet, requireWorksheetInScope, toWorksheetDto } from './worksheets'

/**
 * A released record as one PDF that stands on its own: the record as printed, and embedded in it
 * the record's canonical content, every signature's WebAuthn assertion with what it signed, and the
 * signers' public keys with their registration and revocation times. `npm run verify-record`
 * checks such a file with no server and no database.
 */
export async function worksheetRecordPdf(event: H3Event, id: number, scope: Scope): Promise<Uint8Array> {
  await requireWorksheetInScope(scope, id)
  const row = await findWorksheet(id)
  const worksheet = await toWorksheetDto(row)
  if (worksheet.state !== 'released' && worksheet.state !== 'voided') {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'Only a released (or voided) worksheet is issued as a PDF record; use the print page to review a draft.',
    })
  }
  const runtime = useRuntimeConfig()
  const config = runtime.public
  // Dated in the time zone of the aircraft's station, and issued under its operator's name.
  const aircraft = await Aircraft.findByPk(row.aircraftId, { attributes: ['base', 'operatorId'] })
  const station = await stationNamed(aircraft?.base)
  const operatorName = aircraft ? (await operatorNames())(aircraft.operatorId ?? null) : ''
  const printedWith = {
    locale: String(config.locale),
    timeZone: station?.timeZone ?? String(config.stationTimeZone),
    showZone: true as const,
  }
  const signedRecord = signedRecordOf(worksheet)
  const contentHash = contentHashOf(fieldDigests(signedRecord))
  const address = publicAddress(event)
  const record: EmbeddedRecord = {
    format: 'chargewell-record-export/1',
    exportedAt: new Date().toISOString(),
    operator: operatorName || String(runtime.operatorName ?? ''),
    station: station?.name ?? String(runtime.stationName ?? ''),
    printedWith,
    verifyAddress: `${address}/verify`,
    contentHash,
    canonicalContent: signedRecord,
    worksheet,
  }
  const signatures: EmbeddedSignatures = {
    format: 'chargewell-signatures/1',
    signatures: [...(row.signatures ?? [])]
      .sort((a, b) => a.signedAt.getTime() - b.signedAt.getTime() || a.id - b.id)
      .map((signature: Signature & { passkey?: Passkey | null }) => ({
        capacity: signature.capacity,
        round: signature.round,
        userId: signature.userId,
        name: signature.name,
        authorisationNumber: signature.authorisationNumber,
        statement: signature.statement,
        signedAt: signature.signedAt.toISOString(),
        method: signature.method ?? null,
        payload: signature.payload ?? null,
        signedFields: signature.signedFields ?? null,
        assertion: signature.assertion ?? null,
        key: signature.passkey
          ? {
              name: signature.passkey.name,
              credentialId: signature.passkey.credentialId,
              publicKey: signature.passkey.publicKey,
              fingerprint: keyFingerprint(signature.passkey.publicKey),
              registeredAt: signature.passkey.registeredAt.toISOString(),
              revokedAt: signature.passkey.revokedAt?.toISOString() ?? null,
            }
          : null,
      })),
  }
  const photos = []
  for (const attachment of worksheet.attachments) {
    if (!['image/jpeg', 'image/png'].includes(attachment.mimeType)) continue
    const { data } = await readAttachment(attachment.id)
    photos.push({
      id: attachment.id,
      name: attachment.originalName,
      mimeType: attachment.mimeType,
      sha256: attachment.sha256,
      bytes: new Uint8Array(data),
    })
  }
  return worksheetPdf({ record, signatures, photos })
}
