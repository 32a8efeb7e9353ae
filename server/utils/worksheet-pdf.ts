import QRCode from 'qrcode'
import type { EmbeddedRecord, EmbeddedSignatures } from '#shared/types/record-proof'
import { NITROGEN_CAUTIONS } from '#shared/utils/cautions'
import { displayFormat } from '#shared/utils/station-time'
import { worksheetRecordSections, type RecordTone } from '#shared/utils/worksheet-record'
import { PdfWriter } from './pdf-writer'

const COLOUR: Partial<Record<RecordTone, [number, number, number]>> = {
  fault: [0.55, 0.1, 0.07],
  sound: [0.08, 0.35, 0.2],
  warning: [0.54, 0.35, 0],
  quiet: [0.3, 0.38, 0.4],
}

export const RECORD_FILE = 'chargewell-record.json'
export const SIGNATURES_FILE = 'chargewell-signatures.json'

export interface RecordPhoto {
  id: number
  name: string
  mimeType: string
  sha256: string | null
  bytes: Uint8Array
}

/** The line at the foot of every page of a record. */
export function recordFooter(record: Pick<EmbeddedRecord, 'operator' | 'station' | 'worksheet'>, page: number, pages: number): string {
  const where = [record.operator, record.station].filter(Boolean).join(' · ')
  return `Worksheet ${record.worksheet.id}${where ? ` · ${where}` : ''} · page ${page} of ${pages}`
}

/**
 * The worksheet as the record a records office files: the same sections the record page shows (every
 * time with its zone), the photos with their SHA-256, the content hash and a QR code that opens the
 * verify page, the worksheet number and "page x of y" on every page; and embedded, what lets the file
 * be verified on its own (server/utils/record-verify.ts).
 */
export async function worksheetPdf(evidence: {
  record: EmbeddedRecord
  signatures: EmbeddedSignatures
  photos: RecordPhoto[]
}): Promise<Uint8Array> {
  const { record, signatures, photos } = evidence
  const worksheet = record.worksheet
  const pdf = await PdfWriter.create(`Chargewell worksheet ${worksheet.id}`)
  pdf.write('Chargewell — accumulator servicing record', { bold: true, size: 16, gap: 4 })
  if (record.operator || record.station)
    pdf.write([record.operator && `Operator: ${record.operator}`, record.station && `Station: ${record.station}`].filter(Boolean).join(' · '), { bold: true })
  pdf.write(`Times are at the station, time zone ${record.printedWith.timeZone}.`, { colour: COLOUR.quiet })
  pdf.write(`Record content hash (SHA-256): ${record.contentHash}`, { colour: COLOUR.quiet, gap: 4 })
  const verifyLink = `${record.verifyAddress}?worksheet=${worksheet.id}&hash=${record.contentHash}`
  const qr = QRCode.create(verifyLink, { errorCorrectionLevel: 'M' })
  pdf.qrCode(qr.modules.data, qr.modules.size)
  pdf.write(`Verify this record: open ${record.verifyAddress} and drop this file on it, or run "npm run verify-record -- <file>" from Chargewell's source, with no server.`, { colour: COLOUR.quiet, gap: 4 })

  for (const section of worksheetRecordSections(worksheet, displayFormat(record.printedWith))) {
    pdf.heading(section.title)
    for (const line of section.lines) {
      pdf.write(line.label ? `${line.label}: ${line.text}` : line.text, {
        bold: line.tone === 'strong' || line.tone === 'fault',
        colour: line.tone ? COLOUR[line.tone] : undefined,
      })
    }
  }
  if (photos.length) {
    pdf.heading('Photos')
    for (const photo of photos) {
      pdf.image(photo.bytes, photo.mimeType)
      pdf.write(`${photo.name} · SHA-256 ${photo.sha256 ?? 'not recorded'}`, { colour: COLOUR.quiet, gap: 4 })
    }
  }
  pdf.heading(NITROGEN_CAUTIONS.title)
  for (const caution of NITROGEN_CAUTIONS.items) pdf.write(`• ${caution}`)
  pdf.write(NITROGEN_CAUTIONS.governs, { bold: true })
  pdf.footer((page, pages) => recordFooter(record, page, pages))
  const encoder = new TextEncoder()
  pdf.attach(RECORD_FILE, encoder.encode(JSON.stringify(record, null, 1)), 'application/json', 'The record as printed: its content, how it was printed, and its content hash.')
  pdf.attach(SIGNATURES_FILE, encoder.encode(JSON.stringify(signatures, null, 1)), 'application/json', 'Each signature: what it signed, the WebAuthn assertion, and the signer\'s public key with its registration and revocation times.')
  return pdf.save()
}
