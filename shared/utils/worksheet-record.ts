import { formatPressure, formatPressureValue, formatTemperature, unitLabel } from '../gas/format'
import type { Pressure, Temperature } from '../gas/types'
import {
  PREPARATION_CHECKS, PREPARATION_LABELS, WORKSHEET_STATE_LABELS, type WorksheetDto, type WorksheetObservation,
} from '../types/worksheet'
import type { displayFormat } from './station-time'
import type { AssessmentSummary } from './worksheet-results'
import { STEP_NAMES } from './worksheet-steps'

/** A reading's verdict in words, wherever a verdict is shown (the codes stay in exports and the API). */
export const VERDICT_WORDS: Record<string, string> = { 'in-limits': 'In limits', 'low': 'Low', 'high': 'High' }

/** The verdict in words, or a dash when there is none yet. */
export function verdictWords(verdict: string | null | undefined): string {
  return verdict ? (VERDICT_WORDS[verdict] ?? verdict) : '—'
}

/**
 * The signed record, laid out once: the page (WorksheetRecord.vue) and the PDF
 * (server/utils/worksheet-pdf.ts) draw these same sections, so they can never word a record
 * differently. Dates come through the one display format (station time zone, user's locale).
 */
export type RecordTone = 'normal' | 'strong' | 'fault' | 'sound' | 'quiet' | 'warning'
export interface RecordLine { text: string, label?: string, tone?: RecordTone }
export interface RecordSection { id: string, title: string, lines: RecordLine[] }

type Display = ReturnType<typeof displayFormat>

/** A reading's verdict in words: "In limits — +3.2 psi from the target" or "Low — below the band by 40.0 psi". */
export function verdictSummary(result: AssessmentSummary): { title: string, detail: string, tone: 'fault' | 'sound' } {
  const { assessment, target } = result
  const by = `${formatPressureValue(assessment.outsideBy, target.unit)} ${target.unit}`
  if (assessment.verdict === 'low') return { title: 'Low', detail: `below the band by ${by}`, tone: 'fault' }
  if (assessment.verdict === 'high') return { title: 'High', detail: `above the band by ${by}`, tone: 'fault' }
  const difference = `${assessment.difference >= 0 ? '+' : '−'}${formatPressureValue(Math.abs(assessment.difference), target.unit)} ${target.unit}`
  return { title: 'In limits', detail: `${difference} from the target`, tone: 'sound' }
}

function readingLines(label: string, reading: WorksheetDto['content']['asFound'], result: AssessmentSummary | undefined): RecordLine[] {
  if (!reading || !result) return [{ label, text: 'not recorded', tone: 'quiet' }]
  const verdict = verdictSummary(result)
  return [
    { label, text: `${formatPressure(reading.reading)} at ${formatTemperature(result.gasTemperature)} — ${verdict.title.toUpperCase()}, ${verdict.detail}`, tone: verdict.tone },
    { text: `Target ${formatPressure(result.target)}, limits ${formatPressure(result.low)} to ${formatPressure(result.high)}; atmosphere ${formatPressure(result.ambientPressure)}.` },
    ...result.assessment.warnings.map(warning => ({ text: `⚠ ${warning}`, tone: 'warning' as const })),
    { text: `${result.method} · engine ${result.engineVersion}`, tone: 'quiet' },
  ]
}

/** What a step kept as observed said, in words. */
function observedWords({ step, values }: WorksheetObservation): string {
  if (step === 'tools') return 'chose the gauge and nitrogen cart'
  if (step === 'preparation') return 'confirmed the preparation'
  const pressure = values.reading as Pressure | undefined
  const temperature = values.gasTemperature as Temperature | undefined
  const parts = [
    pressure?.value !== undefined ? `read ${formatPressure(pressure)}` : '',
    temperature?.value !== undefined ? `gas temperature ${formatTemperature(temperature)}` : '',
    typeof values.kind === 'string' ? `action ${values.kind}` : '',
    typeof values.remarks === 'string' && values.remarks ? `remarks “${values.remarks}”` : '',
  ].filter(Boolean)
  return parts.join(', ') || 'entered as the step asks'
}

/** Steps kept as observed, in words: each with its time, the gauge in hand, and why it does not count. */
export function observationLines(observations: WorksheetObservation[], display: Display): RecordLine[] {
  return observations.flatMap(observation => [
    {
      label: STEP_NAMES[observation.step as keyof typeof STEP_NAMES] ?? observation.step,
      text: `${observedWords(observation)} — taken ${display.dateTime(observation.takenAt)}`
        + `${observation.claimedAt && observation.claimedAt !== observation.takenAt ? ` (the device said ${display.dateTime(observation.claimedAt)})` : ''}`
        + `${observation.gauge ? ` with gauge ${observation.gauge.assetNumber}` : ''}; received ${display.dateTime(observation.receivedAt)}`,
      tone: 'warning' as const,
    },
    { text: `Not counted: ${observation.reason}`, tone: 'quiet' as const },
  ])
}

export function worksheetRecordSections(worksheet: WorksheetDto, display: Display): RecordSection[] {
  const { content, results } = worksheet
  const specification = content.specification
  const sections: RecordSection[] = []

  const status: RecordLine[] = [{ label: 'State', text: WORKSHEET_STATE_LABELS[worksheet.state], tone: 'strong' }]
  if (worksheet.voidReason) status.push({ label: 'Voided', text: worksheet.voidReason, tone: 'fault' })
  if (worksheet.returnReason && worksheet.state === 'returned') status.push({ label: 'Returned', text: worksheet.returnReason, tone: 'fault' })
  if (worksheet.correctsId) status.push({ label: 'Corrects', text: `worksheet ${worksheet.correctsId}` })
  if (worksheet.correctedBy.length) status.push({ label: 'Corrected by', text: worksheet.correctedBy.map(id => `worksheet ${id}`).join(', '), tone: 'warning' })
  status.push({ label: 'Work order', text: `${worksheet.workOrder} (${worksheet.reason})` })
  status.push({ label: 'Engine', text: `version ${worksheet.engineVersion}`, tone: 'quiet' })
  sections.push({ id: 'record', title: `Worksheet ${worksheet.id}`, lines: status })

  sections.push({
    id: 'unit',
    title: 'Aircraft and unit',
    lines: [
      { label: 'Aircraft', text: `${content.aircraft.registration} · fleet ${content.aircraft.fleetNumber} · ${content.aircraft.type}` },
      { label: 'Position', text: content.accumulator.position },
      { label: 'Unit', text: `P/N ${content.accumulator.partNumber} · S/N ${content.accumulator.serialNumber}` },
      {
        label: 'Specification',
        text: `${specification.partNumber} rev ${specification.revision}: ${specification.title} — ${specification.referencePressure} ${specification.pressureUnit} ${specification.pressureBasis} at `
          + `${specification.referenceTemperature} ${unitLabel(specification.referenceTemperatureUnit)}, −${specification.toleranceMinus}/+${specification.tolerancePlus} ${specification.toleranceUnit}; `
          + `correction ${specification.correctionMethod === 'table' ? 'by the approved-data table' : `by gas law (${specification.gasModel} gas)`}; settle time ${specification.settleMinutes} min`,
      },
      { label: 'Approved data', text: `${specification.dataReference}, ${specification.dataRevision}` },
    ],
  })

  const tools: RecordLine[] = PREPARATION_CHECKS.map(check => ({
    text: `${content.preparation?.[check] ? '☑' : '☐'} ${PREPARATION_LABELS[check]} — ${content.preparation?.[check] ? display.time(content.preparation[check]) : 'not confirmed'}`,
    tone: content.preparation?.[check] ? 'normal' : 'fault',
  }))
  if (content.tools) {
    const gauge = content.tools.gauge
    const accuracy = gauge.accuracy ? `, ±${formatPressureValue(gauge.accuracy.value, gauge.accuracy.unit)} ${gauge.accuracy.unit}` : ''
    tools.push({ label: 'Gauge', text: `${gauge.assetNumber} (${gauge.description}), calibration due ${display.day(gauge.calibrationDue)}${accuracy}` })
    tools.push({ label: 'Nitrogen cart', text: `${content.tools.cart.assetNumber} (${content.tools.cart.description})${content.tools.cart.calibrationDue ? `, due ${display.day(content.tools.cart.calibrationDue)}` : ''}` })
  }
  sections.push({ id: 'preparation', title: 'Preparation and tools', lines: tools })

  const readings: RecordLine[] = []
  if (content.conditions) {
    const { ambient } = content.conditions
    const atmosphere = 'elevation' in ambient ? `field elevation ${ambient.elevation.value} ${ambient.elevation.unit}` : `station pressure ${formatPressure(ambient.pressure)}`
    readings.push({
      label: 'Conditions',
      text: `gas temperature ${formatTemperature(content.conditions.gasTemperature)} (${content.conditions.temperatureMethod === 'shell' ? 'on the shell' : 'ambient, in shade'}), `
        + `${content.conditions.minutesSinceOperated} min since the system was operated, ${atmosphere}`,
    })
  }
  readings.push(...readingLines('As-found', content.asFound, results.asFound))
  readings.push({ label: 'Action', text: content.action ? `${content.action.kind} (${display.dateTime(content.action.recordedAt)})` : 'not recorded' })
  readings.push(...readingLines('As-left', content.asLeft, results.asLeft))
  if (content.asLeft?.confirmedUnchanged) readings.push({ text: 'The performer confirmed this as-left though no charge or vent was recorded.', tone: 'warning' })
  sections.push({ id: 'readings', title: 'Conditions and readings', lines: readings })

  if (content.finish) {
    const finish = content.finish
    const serviceable = worksheet.serviceable === null ? 'not signed yet' : worksheet.serviceable ? 'yes' : `no — defect/deferral ${finish.unserviceableReference ?? ''}`
    sections.push({
      id: 'finish',
      title: 'Finish',
      lines: [
        { label: 'Charging valve leak check', text: finish.valveLeakCheck ? 'done' : 'NOT DONE', tone: finish.valveLeakCheck ? 'normal' : 'fault' },
        { label: 'Valve cap', text: finish.capFitted ? 'fitted' : 'NOT FITTED', tone: finish.capFitted ? 'normal' : 'fault' },
        { label: 'Serviceable', text: serviceable, tone: worksheet.serviceable === false ? 'fault' : 'normal' },
        ...(finish.remarks ? [{ label: 'Remarks', text: finish.remarks }] : []),
      ],
    })
  }

  // The record's times are the server's. Where a device kept a step with no signal, the time it gave is
  // shown beside the server's receipt, so a reader sees which times rest on a device's clock.
  const timeline = content.timeline ?? []
  if (timeline.some(receipt => receipt.claimedAt)) {
    sections.push({
      id: 'times',
      title: 'Times kept on a device',
      lines: timeline.map(receipt => ({
        label: STEP_NAMES[receipt.step as keyof typeof STEP_NAMES] ?? receipt.step,
        text: receipt.claimedAt
          ? `taken on the device ${display.dateTime(receipt.claimedAt)} (its clock); received ${display.dateTime(receipt.receivedAt)}`
          : `received ${display.dateTime(receipt.receivedAt)}`,
        tone: receipt.claimedAt ? 'normal' as const : 'quiet' as const,
      })),
    })
  }

  // Steps taken on a device that could not count when they reached the server: never dropped, shown as
  // observed with their time, the gauge in hand and why, beside the steps that count.
  if (content.observations?.length) {
    sections.push({ id: 'observations', title: 'Observed on the device, not counted', lines: observationLines(content.observations, display) })
  }

  if (worksheet.attachments.length) {
    sections.push({
      id: 'attachments',
      title: 'Attachments',
      lines: worksheet.attachments.map(attachment => ({
        label: attachment.kind,
        text: `${attachment.originalName}${attachment.sha256 ? ` · SHA-256 ${attachment.sha256}` : ''}`,
      })),
    })
  }

  sections.push({
    id: 'signatures',
    title: 'Signatures',
    lines: worksheet.signatures.length
      ? worksheet.signatures.flatMap(signature => [
          {
            text: `${signature.capacity === 'performer' ? 'Performed by' : 'Independent inspection by'} ${signature.name} (${signature.authorisationNumber ?? 'no authorisation number'}) — ${display.dateTime(signature.signedAt)}`,
            tone: 'strong' as const,
          },
          { text: `“${signature.statement}”`, tone: 'quiet' as const },
          {
            text: signature.method === 'passkey'
              ? `Signed with a passkey, key ${signature.keyFingerprint ?? 'unknown'}`
              : 'Signed with the password re-entered',
            tone: 'quiet' as const,
          },
        ])
      : [{ text: 'Not signed yet.', tone: 'quiet' }],
  })
  return sections
}
