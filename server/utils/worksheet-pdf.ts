import { formatPressure, formatTemperature } from '../../shared/gas/format'
import { WORKSHEET_STATE_LABELS, PREPARATION_CHECKS, PREPARATION_LABELS, type WorksheetDto } from '../../shared/types/worksheet'
import type { AssessmentSummary } from '../../shared/utils/worksheet-results'
import { CAUTIONS, PdfWriter } from './pdf-writer'

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
  const pdf = await PdfWriter.create(`Chargewell worksheet ${worksheet.id}`)
  const write = (text: string, options: { font?: 'bold', size?: number, gap?: number, colour?: [number, number, number] } = {}) => pdf.write(text, { ...options, bold: options.font === 'bold' })
  const heading = (text: string) => pdf.heading(text)

  const { content, results } = worksheet
  const specification = content.specification
  write('Chargewell - accumulator servicing record', { font: 'bold', size: 16, gap: 4 })
  write(`Worksheet ${worksheet.id} - ${WORKSHEET_STATE_LABELS[worksheet.state]}${worksheet.correctsId ? ` - corrects worksheet ${worksheet.correctsId}` : ''}${worksheet.correctedBy.length ? ` - corrected by worksheet ${worksheet.correctedBy.join(', ')}` : ''}`, { font: 'bold' })
  if (worksheet.voidReason) write(`VOIDED: ${worksheet.voidReason}`, { font: 'bold', colour: [0.55, 0.1, 0.07] })
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
    write(`${signature.capacity === 'performer' ? 'Performed by' : 'Independent inspection by'} ${signature.name} (authorisation ${signature.authorisationNumber ?? 'none'}) at ${signature.signedAt}`, { font: 'bold' })
    write(`"${signature.statement}"`)
  }

  heading('Cautions')
  for (const caution of CAUTIONS) write(caution)
  return pdf.save()
}
