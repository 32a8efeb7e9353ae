import type { WorksheetDto } from '#shared/types/worksheet'
import { NITROGEN_CAUTIONS } from '#shared/utils/cautions'
import { worksheetRecordSections, type RecordTone } from '#shared/utils/worksheet-record'
import { PdfWriter } from './pdf-writer'

const COLOUR: Partial<Record<RecordTone, [number, number, number]>> = {
  fault: [0.55, 0.1, 0.07],
  sound: [0.08, 0.35, 0.2],
  warning: [0.54, 0.35, 0],
  quiet: [0.3, 0.38, 0.4],
}

/** The worksheet as a record to print or file: the same sections the record page shows, then the cautions. */
export async function worksheetPdf(worksheet: WorksheetDto): Promise<Uint8Array> {
  const pdf = await PdfWriter.create(`Chargewell worksheet ${worksheet.id}`)
  pdf.write('Chargewell — accumulator servicing record', { bold: true, size: 16, gap: 4 })
  for (const section of worksheetRecordSections(worksheet, displayFormatOfStation())) {
    pdf.heading(section.title)
    for (const line of section.lines) {
      pdf.write(line.label ? `${line.label}: ${line.text}` : line.text, {
        bold: line.tone === 'strong' || line.tone === 'fault',
        colour: line.tone ? COLOUR[line.tone] : undefined,
      })
    }
  }
  pdf.heading(NITROGEN_CAUTIONS.title)
  for (const caution of NITROGEN_CAUTIONS.items) pdf.write(`• ${caution}`)
  pdf.write(NITROGEN_CAUTIONS.governs, { bold: true })
  return pdf.save()
}
