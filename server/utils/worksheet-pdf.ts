import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib'
import { formatPressure, formatTemperature } from '../../shared/gas/format'
import { WORKSHEET_STATE_LABELS, PREPARATION_CHECKS, PREPARATION_LABELS, type WorksheetDto } from '../../shared/types/worksheet'
import type { AssessmentSummary } from '../../shared/utils/worksheet-results'

export const CAUTIONS = [
  'High-pressure nitrogen can kill.',
  'Use only dry, oil-free nitrogen - never oxygen or shop air.',
  'Depressurise the hydraulic system first.',
  'Charge through a regulator, slowly. Wear eye protection. Stay clear of the valve line.',
  'Every figure is an aid: the approved maintenance data, the operator\'s procedures and local regulations govern.',
]

/** The standard PDF fonts encode WinAnsi only: map the few characters outside it. */
function printable(text: string): string {
  return text
    .replace(/[−–—]/g, '-').replace(/[‘’]/g, '\'').replace(/[“”]/g, '"').replace(/³/g, '3').replace(/ⁿ/g, '^n')
    .replace(/→/g, '->').replace(/≤/g, '<=').replace(/≥/g, '>=').replace(/[^\n\r\x20-\x7E\xA0-\xFF]/g, '?')
}

const VERDICT: Record<string, string> = { 'in-limits': 'IN LIMITS', 'low': 'LOW', 'high': 'HIGH' }

function readingLine(label: string, reading: string, summary: AssessmentSummary | undefined): string[] {
  if (!summary) return [`${label}: not recorded`]
  const { assessment } = summary
  const by = assessment.verdict === 'in-limits' ? '' : ` by ${assessment.outsideBy.toFixed(1)} ${summary.target.unit}`
  return [
    `${label}: ${reading} at ${formatTemperature(summary.gasTemperature)} - ${VERDICT[assessment.verdict]}${by}`,
    `   target ${formatPressure(summary.target)}, limits ${formatPressure(summary.low)} to ${formatPressure(summary.high)}; atmosphere ${formatPressure(summary.ambientPressure)}`,
    `   method: ${summary.method}`,
    ...assessment.warnings.map(warning => `   warning: ${warning}`),
  ]
}

/** The worksheet as a record to print or file: every reading, calculation, tool and signature. */
export async function worksheetPdf(worksheet: WorksheetDto): Promise<Uint8Array> {
  const document = await PDFDocument.create()
  document.setTitle(`Chargewell worksheet ${worksheet.id}`)
  document.setCreator('Chargewell')
  const regular = await document.embedFont(StandardFonts.Helvetica)
  const bold = await document.embedFont(StandardFonts.HelveticaBold)
  const margin = 50
  let page: PDFPage = document.addPage([595.28, 841.89])
  let y = page.getHeight() - margin

  const write = (text: string, options: { font?: PDFFont, size?: number, gap?: number, colour?: [number, number, number] } = {}) => {
    const font = options.font ?? regular
    const size = options.size ?? 10
    const width = page.getWidth() - 2 * margin
    const words = printable(text).split(' ')
    let line = ''
    const lines: string[] = []
    for (const word of words) {
      const candidate = line ? `${line} ${word}` : word
      if (font.widthOfTextAtSize(candidate, size) > width && line) {
        lines.push(line)
        line = `   ${word}`
      }
      else line = candidate
    }
    lines.push(line)
    for (const text of lines) {
      if (y < margin + size) {
        page = document.addPage([595.28, 841.89])
        y = page.getHeight() - margin
      }
      page.drawText(text, { x: margin, y, size, font, color: rgb(...(options.colour ?? [0.04, 0.16, 0.19])) })
      y -= size * 1.35
    }
    y -= options.gap ?? 0
  }
  const heading = (text: string) => {
    y -= 6
    write(text, { font: bold, size: 12, gap: 2 })
  }

  const { content, results } = worksheet
  const specification = content.specification
  write('Chargewell - accumulator servicing record', { font: bold, size: 16, gap: 4 })
  write(`Worksheet ${worksheet.id} - ${WORKSHEET_STATE_LABELS[worksheet.state]}${worksheet.correctsId ? ` - corrects worksheet ${worksheet.correctsId}` : ''}${worksheet.correctedBy.length ? ` - corrected by worksheet ${worksheet.correctedBy.join(', ')}` : ''}`, { font: bold })
  if (worksheet.voidReason) write(`VOIDED: ${worksheet.voidReason}`, { font: bold, colour: [0.55, 0.1, 0.07] })
  write(`Work order ${worksheet.workOrder}, reason: ${worksheet.reason}. Engine version ${worksheet.engineVersion}.`)

  heading('Aircraft and unit')
  write(`${content.aircraft.registration} (fleet ${content.aircraft.fleetNumber}, ${content.aircraft.type}) - ${content.accumulator.position}`)
  write(`P/N ${content.accumulator.partNumber}, S/N ${content.accumulator.serialNumber}`)

  heading('Specification and approved data')
  write(`${specification.partNumber} rev ${specification.revision}: ${specification.title}`)
  write(`Approved data ${specification.dataReference}, ${specification.dataRevision}. Pre-charge ${specification.referencePressure} ${specification.pressureUnit} ${specification.pressureBasis} at ${specification.referenceTemperature} deg ${specification.referenceTemperatureUnit}, tolerance -${specification.toleranceMinus}/+${specification.tolerancePlus} ${specification.toleranceUnit}; correction ${specification.correctionMethod === 'table' ? 'by the approved-data table' : `by gas law (${specification.gasModel} gas)`}; settle time ${specification.settleMinutes} min.`)

  heading('Preparation')
  for (const check of PREPARATION_CHECKS) write(`${content.preparation?.[check] ? `[x] ${content.preparation[check]}` : '[ ] not confirmed'} - ${PREPARATION_LABELS[check]}`)

  heading('Tools')
  if (content.tools) {
    write(`Gauge ${content.tools.gauge.assetNumber} (${content.tools.gauge.description}), calibration due ${content.tools.gauge.calibrationDue ?? 'none'}${content.tools.gauge.accuracy ? `, accuracy +/-${content.tools.gauge.accuracy.value.toFixed(1)} ${content.tools.gauge.accuracy.unit}` : ''}`)
    write(`Nitrogen cart ${content.tools.cart.assetNumber} (${content.tools.cart.description}), due ${content.tools.cart.calibrationDue ?? 'n/a'}`)
  }

  heading('Conditions and readings')
  if (content.conditions) {
    const ambient = 'elevation' in content.conditions.ambient ? `field elevation ${content.conditions.ambient.elevation.value} ${content.conditions.ambient.elevation.unit}` : `station pressure ${formatPressure(content.conditions.ambient.pressure)}`
    write(`Gas temperature ${formatTemperature(content.conditions.gasTemperature)} (${content.conditions.temperatureMethod === 'shell' ? 'on the shell' : 'ambient, in shade'}), ${content.conditions.minutesSinceOperated} min since the system was operated, ${ambient}.`)
  }
  for (const line of readingLine('As-found', content.asFound ? formatPressure(content.asFound.reading) : '', results.asFound)) write(line)
  write(`Action: ${content.action?.kind ?? 'not recorded'}${content.action ? ` at ${content.action.recordedAt}` : ''}`)
  for (const line of readingLine('As-left', content.asLeft ? formatPressure(content.asLeft.reading) : '', results.asLeft)) write(line)

  heading('Finish')
  if (content.finish) {
    write(`Charging valve leak check: ${content.finish.valveLeakCheck ? 'done' : 'NOT DONE'}. Valve cap fitted: ${content.finish.capFitted ? 'yes' : 'NO'}.`)
    write(`Serviceable: ${worksheet.serviceable === null ? 'not signed' : worksheet.serviceable ? 'yes' : `no - defect/deferral ${content.finish.unserviceableReference ?? ''}`}`)
    if (content.finish.remarks) write(`Remarks: ${content.finish.remarks}`)
  }
  if (worksheet.attachments.length) write(`Attachments: ${worksheet.attachments.map(attachment => `${attachment.kind} "${attachment.originalName}"`).join(', ')}`)

  heading('Signatures')
  if (!worksheet.signatures.length) write('Not signed.')
  for (const signature of worksheet.signatures) {
    write(`${signature.capacity === 'performer' ? 'Performed by' : 'Independent inspection by'} ${signature.name} (authorisation ${signature.authorisationNumber ?? 'none'}) at ${signature.signedAt}`, { font: bold })
    write(`"${signature.statement}"`)
  }

  heading('Cautions')
  for (const caution of CAUTIONS) write(caution)
  return document.save()
}
