import type { H3Event } from 'h3'
import type { Transaction } from 'sequelize'
import { ENGINE_VERSION } from '../../shared/gas/version'
import type { WorksheetStepBody } from '../../shared/schemas/worksheet'
import type { Decision } from '../../shared/utils/worksheet-rules'
import { assessWorksheetReading } from '../../shared/utils/worksheet-results'
import type { Pressure } from '../../shared/gas/types'
import { convertPressureDifference } from '../../shared/gas/units'
import type { ToolSnapshot, WorksheetContent, WorksheetDto, WorksheetResults } from '../../shared/types/worksheet'
import { PREPARATION_CHECKS } from '../../shared/types/worksheet'
import { Attachment, Signature, Tool, User, Worksheet } from '../models'
import { isEngineInputError } from '../../shared/gas/errors'
import { gaugeAccuracy } from '../../shared/utils/tool-accuracy'

/** Throws the rule's refusal as an HTTP error (403 or 409 with the reason). */
export function enforce(decision: Decision): void {
  if (!decision.allowed) throw createError({ status: decision.status, statusMessage: decision.status === 409 ? 'Conflict' : 'Forbidden', message: decision.reason })
}

export async function findWorksheet(id: number, transaction?: Transaction): Promise<Worksheet> {
  const worksheet = await Worksheet.findByPk(id, {
    include: [
      { model: Signature, as: 'signatures' },
      { model: Attachment, as: 'attachments' },
      { model: User, as: 'performer', attributes: ['id', 'name'] },
    ],
    transaction,
  })
  if (!worksheet) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Worksheet not found.' })
  return worksheet
}

/** A worksheet as the API answers it, with its row version as the ETag (for If-Match). */
export async function worksheetAnswer(event: H3Event, id: number): Promise<WorksheetDto> {
  const worksheet = await findWorksheet(id)
  setVersionTag(event, worksheet.version)
  return toWorksheetDto(worksheet)
}

export function settleUntil(content: WorksheetContent): string | null {
  if (!content.action || content.action.kind === 'none') return null
  return new Date(Date.parse(content.action.recordedAt) + content.specification.settleMinutes * 60_000).toISOString()
}

export async function toWorksheetDto(worksheet: Worksheet): Promise<WorksheetDto> {
  const correctedBy = await Worksheet.findAll({ where: { correctsId: worksheet.id }, attributes: ['id'] })
  const performer = (worksheet as Worksheet & { performer?: User }).performer
  const content = worksheet.content as unknown as WorksheetContent
  return {
    id: worksheet.id,
    state: worksheet.state,
    version: worksheet.version,
    round: worksheet.round,
    workOrder: worksheet.workOrder,
    reason: worksheet.reason,
    performer: { id: worksheet.performerId, name: performer?.name ?? '' },
    correctsId: worksheet.correctsId,
    correctedBy: correctedBy.map(row => row.id),
    content,
    results: worksheet.results as WorksheetResults,
    engineVersion: worksheet.engineVersion,
    serviceable: worksheet.serviceable,
    returnReason: worksheet.returnReason,
    voidReason: worksheet.voidReason,
    performedAt: worksheet.performedAt?.toISOString() ?? null,
    submittedAt: worksheet.submittedAt?.toISOString() ?? null,
    releasedAt: worksheet.releasedAt?.toISOString() ?? null,
    createdAt: worksheet.createdAt.toISOString(),
    updatedAt: worksheet.updatedAt.toISOString(),
    signatures: (worksheet.signatures ?? []).sort((a, b) => a.signedAt.getTime() - b.signedAt.getTime() || a.id - b.id).map(signature => ({
      capacity: signature.capacity, name: signature.name, authorisationNumber: signature.authorisationNumber, statement: signature.statement,
      signedAt: signature.signedAt.toISOString(), round: signature.round,
    })),
    attachments: ((worksheet as Worksheet & { attachments?: Attachment[] }).attachments ?? []).map(attachment => ({
      id: attachment.id, kind: attachment.kind, originalName: attachment.originalName, mimeType: attachment.mimeType, sizeBytes: attachment.sizeBytes,
    })),
    settleUntil: settleUntil(content),
  }
}

function refuse(message: string, field?: string, status: 409 | 422 = 422, extra: Record<string, unknown> = {}): never {
  throw createError({
    status,
    statusMessage: status === 409 ? 'Conflict' : 'Unprocessable Entity',
    message,
    data: field ? { field, issues: [{ path: field.split('.'), field, message }], ...extra } : undefined,
  })
}

/**
 * With no charge or vent, the as-left should read what the as-found did (compared at the same
 * temperature): beyond twice the gauge's accuracy, or 1 % of the target, something happened that
 * the record does not say. The technician records the action, or confirms the reading.
 */
function checkUnchanged(content: WorksheetContent, results: WorksheetResults, confirmed: boolean | undefined): void {
  if (content.action?.kind !== 'none' || !results.asFound || !results.asLeft || confirmed) return
  const unit = results.asLeft.target.unit
  const moved = Math.abs(results.asLeft.assessment.difference - results.asFound.assessment.difference)
  const accuracy = content.tools?.gauge.accuracy ? convertPressureDifference(content.tools.gauge.accuracy.value, content.tools.gauge.accuracy.unit, unit) : 0
  const allowance = Math.max(2 * accuracy, 0.01 * Math.abs(results.asLeft.target.value))
  if (moved <= allowance) return
  refuse(
    `The as-left is ${moved.toFixed(1)} ${unit} away from the as-found (at the same temperature), though no charge or vent was recorded. Go back and record the action you took — or, if this reading is right, confirm it.`,
    'reading.value', 422, { confirm: 'confirmedUnchanged' },
  )
}

/** A gauge or cart as the worksheet freezes it; refuses an expired or missing calibration with the reason. */
async function toolSnapshot(id: number, kind: 'gauge' | 'cart', field: string): Promise<ToolSnapshot> {
  const tool = await Tool.findByPk(id)
  if (!tool || tool.kind !== kind || !tool.active) refuse(`No active ${kind === 'gauge' ? 'gauge' : 'nitrogen cart'} with that id in the tool register.`, field)
  if (kind === 'gauge' && !tool.calibrationDue) refuse(`Gauge ${tool.assetNumber} has no calibration record: it cannot be used until it is calibrated.`, field)
  if (tool.calibrationDue && tool.calibrationDue < stationToday()) {
    refuse(`${kind === 'gauge' ? 'Gauge' : 'Cart'} ${tool.assetNumber}: calibration expired on ${tool.calibrationDue}. Use another one and quarantine this one.`, field)
  }
  const accuracy = gaugeAccuracy(tool)
  return { id: tool.id, assetNumber: tool.assetNumber, description: tool.description, calibrationDue: tool.calibrationDue, ...(accuracy ? { accuracy } : {}) }
}

/**
 * A pre-charge lies below the accumulator's working pressures: a reading above the maximum
 * working pressure is the system's pressure, read because the system was not depressurised
 * (or a typing slip). Refused, in the specification's unit.
 */
function checkBelowSystemPressure(reading: Pressure, specification: WorksheetContent['specification'], field: string): void {
  const inSpecificationUnit = convertPressureDifference(reading.value, reading.unit, specification.pressureUnit)
  if (inSpecificationUnit > specification.maxPressure) {
    refuse(`${reading.value} ${reading.unit} is above the unit's maximum working pressure (${specification.maxPressure} ${specification.pressureUnit}): that is system pressure, not the pre-charge. Depressurise the hydraulic system and read again.`, field)
  }
}

/** The gauge must be able to show the reading: refuse one beyond its range. */
function checkWithinGauge(reading: Pressure, gauge: ToolSnapshot, rangeMax: number | null, rangeUnit: string | null, field: string): void {
  if (rangeMax === null || !rangeUnit) return
  const inGaugeUnit = convertPressureDifference(reading.value, reading.unit, rangeUnit as Pressure['unit'])
  if (inGaugeUnit > rangeMax) refuse(`The reading is beyond the range of gauge ${gauge.assetNumber} (${rangeMax} ${rangeUnit}).`, field)
}

function assess(content: WorksheetContent, reading: Pressure, gasTemperature: NonNullable<WorksheetContent['conditions']>['gasTemperature'], field: string) {
  try {
    return assessWorksheetReading(content.specification, reading, gasTemperature, content.conditions!.ambient, content.tools?.gauge)
  }
  catch (error) {
    if (isEngineInputError(error)) refuse(error.message, field)
    throw error
  }
}

/**
 * Applies one completed step to the worksheet's content, recomputing every figure on the
 * server from the frozen specification. Steps build on each other; a later step needs the
 * earlier ones. Returns the new content and results (not yet saved).
 */
export async function applyStep(worksheet: Worksheet, step: WorksheetStepBody): Promise<{ content: WorksheetContent, results: WorksheetResults }> {
  const content = structuredClone(worksheet.content) as unknown as WorksheetContent
  const results = structuredClone(worksheet.results) as WorksheetResults
  const now = new Date().toISOString()
  switch (step.step) {
    case 'preparation': {
      // Each confirmation is stamped when first given; withdrawing one clears it.
      content.preparation = Object.fromEntries(PREPARATION_CHECKS.flatMap((check) => {
        const confirmed = step[check] ?? Boolean(content.preparation?.[check])
        return confirmed ? [[check, content.preparation?.[check] ?? now]] : []
      }))
      break
    }
    case 'tools': {
      content.tools = { gauge: await toolSnapshot(step.gaugeId, 'gauge', 'gaugeId'), cart: await toolSnapshot(step.cartId, 'cart', 'cartId') }
      break
    }
    case 'conditions': {
      const { step: _step, ...conditions } = step
      content.conditions = conditions
      // New conditions change every figure that depends on them.
      delete content.asFound
      delete results.asFound
      break
    }
    case 'asFound': {
      const missing = PREPARATION_CHECKS.filter(check => !content.preparation?.[check])
      if (missing.length) refuse('Confirm every preparation step first: the pre-charge can only be read with the system depressurised.', 'step', 409)
      if (!content.tools) refuse('Record the gauge and cart first.', 'step', 409)
      if (!content.conditions) refuse('Record the conditions (gas temperature, atmosphere) first.', 'step', 409)
      const gauge = await Tool.findByPk(content.tools.gauge.id)
      checkWithinGauge(step.reading, content.tools.gauge, gauge?.rangeMax ?? null, gauge?.rangeUnit ?? null, 'reading.value')
      checkBelowSystemPressure(step.reading, content.specification, 'reading.value')
      content.asFound = { reading: step.reading, recordedAt: now }
      results.asFound = assess(content, step.reading, content.conditions.gasTemperature, 'reading')
      break
    }
    case 'action': {
      if (!content.asFound) refuse('Record the as-found reading first.', 'step', 409)
      content.action = { kind: step.kind, recordedAt: now }
      delete content.asLeft
      delete results.asLeft
      break
    }
    case 'asLeft': {
      if (!content.action) refuse('Record the action (none, charge or vent) first.', 'step', 409)
      const until = settleUntil(content)
      if (until && Date.parse(until) > Date.now()) {
        const minutes = Math.ceil((Date.parse(until) - Date.now()) / 60_000)
        refuse(`Let the gas settle to ambient before the as-left reading: ${minutes} more minute(s) (settle time ${content.specification.settleMinutes} min). A reading taken at once reads high.`, 'reading', 409)
      }
      checkBelowSystemPressure(step.reading, content.specification, 'reading.value')
      content.asLeft = { reading: step.reading, gasTemperature: step.gasTemperature, recordedAt: now, ...(step.confirmedUnchanged ? { confirmedUnchanged: true } : {}) }
      results.asLeft = assess(content, step.reading, step.gasTemperature, 'gasTemperature')
      checkUnchanged(content, results, step.confirmedUnchanged)
      break
    }
    case 'finish': {
      if (!content.asLeft) refuse('Record the as-left reading first.', 'step', 409)
      const { step: _step, ...finish } = step
      content.finish = { ...finish, recordedAt: now }
      break
    }
  }
  return { content, results }
}

/** What still stops the performer from signing; empty when the worksheet is complete. */
export function missingForSignature(content: WorksheetContent, results: WorksheetResults): string[] {
  const missing: string[] = []
  if (PREPARATION_CHECKS.some(check => !content.preparation?.[check])) missing.push('every preparation confirmation')
  if (!content.tools) missing.push('the gauge and nitrogen cart')
  if (!content.conditions) missing.push('the conditions')
  if (!results.asFound) missing.push('the as-found reading')
  if (!content.action) missing.push('the action')
  if (!results.asLeft) missing.push('the as-left reading')
  if (!content.finish) missing.push('the finishing checks')
  else {
    if (!content.finish.valveLeakCheck) missing.push('a charging valve leak check')
    if (!content.finish.capFitted) missing.push('the valve cap fitted')
    if (results.asLeft && results.asLeft.assessment.verdict !== 'in-limits' && !content.finish.unserviceableReference) {
      missing.push('a defect or deferral reference (the as-left is outside limits, so the unit cannot be signed as serviceable)')
    }
  }
  return missing
}

/** The performer's or inspector's password, re-entered to sign. */
export async function confirmPassword(user: Pick<User, 'passwordHash'>, password: string): Promise<void> {
  if (!(await verifyPassword(user.passwordHash, password))) {
    throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'That password is not right; the signature was not made.', data: { issues: [{ path: ['password'], field: 'password', message: 'Not your password.' }] } })
  }
}

/** Recomputes both readings from the content with this engine, for freezing at signature. */
export function recomputeResults(content: WorksheetContent): WorksheetResults {
  const results: WorksheetResults = {}
  if (content.asFound && content.conditions) results.asFound = assess(content, content.asFound.reading, content.conditions.gasTemperature, 'reading')
  if (content.asLeft && content.conditions) results.asLeft = assess(content, content.asLeft.reading, content.asLeft.gasTemperature, 'gasTemperature')
  return results
}

export { ENGINE_VERSION }
