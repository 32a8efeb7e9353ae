import { isEngineInputError } from '../gas/errors'
import type { Pressure } from '../gas/types'
import { convertPressureDifference } from '../gas/units'
import type { WorksheetStepBody } from '../schemas/worksheet'
import type { ToolDto } from '../types/registers'
import {
  PREPARATION_CHECKS, type ToolSnapshot, type WorksheetContent, type WorksheetObservation, type WorksheetResults,
} from '../types/worksheet'
import { stationDisplay } from './station-time'
import { settleUntil } from './worksheet-content'
import { gaugeAccuracy } from './tool-accuracy'
import { assessWorksheetReading } from './worksheet-results'

/**
 * The worksheet's steps as rules, written once and run twice: by the server on every save (the
 * record of truth), and by a tablet with no signal, so the technician sees the same figures and
 * refusals offline — which the server then checks again when the worksheet syncs. Pure: the
 * time, the station's date and the tool register are handed in.
 */

/** Each step's name as the technician sees it: the step navigator, the device's queue, the sync report. */
export const STEP_NAMES: Record<WorksheetStepBody['step'], string> = {
  preparation: 'Preparation',
  tools: 'Tools',
  conditions: 'Conditions',
  asFound: 'As-found',
  action: 'Action',
  asLeft: 'Settle and as-left',
  finish: 'Finish',
  reviewSync: 'Review',
}

export interface StepContext {
  /** When the step was taken (ISO): the server's clock, or the device's for a worksheet filled offline. */
  now: string
  /** The station's date (YYYY-MM-DD): a calibration is good to the end of its due day there. */
  today: string
  /** The tool register as the caller knows it. */
  tool: (id: number) => StepTool | undefined
}

export type StepTool = Pick<
  ToolDto,
  | 'id'
  | 'kind'
  | 'active'
  | 'assetNumber'
  | 'description'
  | 'calibrationDue'
  | 'rangeMax'
  | 'rangeUnit'
  | 'resolution'
  | 'accuracy'
  | 'accuracyUnit'
>

/** A step refused: the reason in the trade's words, the field it concerns, 409 when an earlier step is missing. */
export class StepRefusal extends Error {
  constructor(
    message: string,
    readonly field: string | undefined,
    readonly status: 409 | 422 = 422,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message)
    this.name = 'StepRefusal'
  }
}

function refuse(message: string, field?: string, status: 409 | 422 = 422, extra: Record<string, unknown> = {}): never {
  throw new StepRefusal(message, field, status, extra)
}

/**
 * A gauge or cart as the worksheet freezes it; an inactive, unknown, uncalibrated or expired one is refused with
 * the reason.
 */
export function toolSnapshot(
  tool: StepTool | undefined,
  kind: 'gauge' | 'cart',
  field: string,
  today: string,
): ToolSnapshot {
  const name = kind === 'gauge' ? 'gauge' : 'nitrogen cart'
  if (!tool || tool.kind !== kind || !tool.active) refuse(`No active ${name} with that id in the tool register.`, field)
  if (kind === 'gauge' && !tool.calibrationDue)
    refuse(`Gauge ${tool.assetNumber} has no calibration record: it cannot be used until it is calibrated.`, field)
  if (tool.calibrationDue && tool.calibrationDue < today) {
    refuse(
      `${kind === 'gauge' ? 'Gauge' : 'Cart'} ${tool.assetNumber}: calibration expired on ${stationDisplay().day(tool.calibrationDue)}. Use another one and quarantine this one.`,
      field,
    )
  }
  const accuracy = gaugeAccuracy(tool)
  return {
    id: tool.id,
    assetNumber: tool.assetNumber,
    description: tool.description,
    calibrationDue: tool.calibrationDue,
    ...(accuracy ? { accuracy } : {}),
    ...(kind === 'gauge' && tool.resolution && tool.rangeUnit ? { resolution: { value: tool.resolution, unit: tool.rangeUnit } } : {}),
  }
}

/**
 * A pre-charge lies below the accumulator's working pressures: a reading above the maximum
 * working pressure is the system's pressure, read because the system was not depressurised (or
 * a typing slip). Refused, in the unit typed.
 */
function checkBelowSystemPressure(
  reading: Pressure,
  specification: WorksheetContent['specification'],
  field: string,
): void {
  if (convertPressureDifference(reading.value, reading.unit, specification.pressureUnit) <= specification.maxPressure)
    return
  refuse(
    `${reading.value} ${reading.unit} is above the unit's maximum working pressure (${specification.maxPressure} ${specification.pressureUnit}): `
    + 'that is system pressure, not the pre-charge. Depressurise the hydraulic system and read again.',
    field,
  )
}

/** The gauge must be able to show the reading. */
function checkWithinGauge(reading: Pressure, gauge: ToolSnapshot, tool: StepTool | undefined, field: string): void {
  if (!tool?.rangeMax || !tool.rangeUnit) return
  if (convertPressureDifference(reading.value, reading.unit, tool.rangeUnit) > tool.rangeMax) {
    refuse(`The reading is beyond the range of gauge ${gauge.assetNumber} (${tool.rangeMax} ${tool.rangeUnit}).`, field)
  }
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
  const gauge = content.tools?.gauge.accuracy
  const accuracy = gauge ? convertPressureDifference(gauge.value, gauge.unit, unit) : 0
  if (moved <= Math.max(2 * accuracy, 0.01 * Math.abs(results.asLeft.target.value))) return
  refuse(
    `The as-left is ${moved.toFixed(1)} ${unit} away from the as-found (at the same temperature), though no charge or vent was recorded. `
    + 'Go back and record the action you took — or, if this reading is right, confirm it.',
    'reading.value',
    422,
    { confirm: 'confirmedUnchanged' },
  )
}

function assess(
  content: WorksheetContent,
  reading: Pressure,
  gasTemperature: NonNullable<WorksheetContent['conditions']>['gasTemperature'],
  field: string,
) {
  try {
    return assessWorksheetReading(
      content.specification,
      reading,
      gasTemperature,
      content.conditions!.ambient,
      content.tools?.gauge,
    )
  }
  catch (error) {
    if (isEngineInputError(error)) refuse(error.message, field)
    throw error
  }
}

/**
 * Applies one completed step, recomputing every figure from the frozen specification. Steps
 * build on each other; a later step needs the earlier ones. Returns the new content and results.
 */
export function applyStep(
  current: { content: WorksheetContent, results: WorksheetResults },
  step: WorksheetStepBody,
  context: StepContext,
) {
  const content = structuredClone(current.content)
  const results = structuredClone(current.results)
  const { now } = context
  switch (step.step) {
    case 'preparation': {
      // Each confirmation is stamped when first given; withdrawing one clears it.
      content.preparation = Object.fromEntries(
        PREPARATION_CHECKS.flatMap((check) => {
          const confirmed = step[check] ?? Boolean(content.preparation?.[check])
          return confirmed ? [[check, content.preparation?.[check] ?? now]] : []
        }),
      )
      break
    }
    case 'tools': {
      content.tools = {
        gauge: toolSnapshot(context.tool(step.gaugeId), 'gauge', 'gaugeId', context.today),
        cart: toolSnapshot(context.tool(step.cartId), 'cart', 'cartId', context.today),
      }
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
      if (PREPARATION_CHECKS.some(check => !content.preparation?.[check])) {
        refuse(
          'Confirm every preparation step first: the pre-charge can only be read with the system depressurised.',
          'step',
          409,
        )
      }
      if (!content.tools) refuse('Record the gauge and cart first.', 'step', 409)
      if (!content.conditions) refuse('Record the conditions (gas temperature, atmosphere) first.', 'step', 409)
      checkWithinGauge(step.reading, content.tools.gauge, context.tool(content.tools.gauge.id), 'reading.value')
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
      if (until && Date.parse(until) > Date.parse(now)) {
        const minutes = Math.ceil((Date.parse(until) - Date.parse(now)) / 60_000)
        refuse(
          `Let the gas settle to ambient before the as-left reading: ${minutes} more minute(s) (settle time ${content.specification.settleMinutes} min). `
          + 'A reading taken at once reads high.',
          'reading',
          409,
        )
      }
      checkBelowSystemPressure(step.reading, content.specification, 'reading.value')
      content.asLeft = {
        reading: step.reading,
        gasTemperature: step.gasTemperature,
        recordedAt: now,
        ...(step.confirmedUnchanged ? { confirmedUnchanged: true } : {}),
      }
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
    case 'reviewSync': {
      if (!content.offline) refuse('This worksheet was not filled offline: there is nothing to review.', 'step', 409)
      content.offline = { ...content.offline, reviewedAt: now }
      break
    }
  }
  return { content, results }
}

/**
 * A step the server could not count, kept on the record as observed: what was entered, when (the bounded
 * time and the device's own claim), the gauge in hand and why it does not count.
 */
export function observationOf(
  step: WorksheetStepBody,
  time: { at: string, receivedAt: string, claimedAt?: string },
  reason: string,
  gauge?: { id: number, assetNumber: string },
): WorksheetObservation {
  const { step: name, ...values } = step
  return {
    step: name,
    values: structuredClone(values) as Record<string, unknown>,
    takenAt: time.at,
    ...(time.claimedAt ? { claimedAt: time.claimedAt } : {}),
    receivedAt: time.receivedAt,
    ...(gauge ? { gauge } : {}),
    reason,
  }
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
  if (content.offline?.conflicts.length && !content.offline.reviewedAt) {
    missing.push('your review of what changed when the worksheet was sent from the device')
  }
  if (!content.finish) missing.push('the finishing checks')
  else {
    if (!content.finish.valveLeakCheck) missing.push('a charging valve leak check')
    if (!content.finish.capFitted) missing.push('the valve cap fitted')
    if (results.asLeft && results.asLeft.assessment.verdict !== 'in-limits' && !content.finish.unserviceableReference) {
      missing.push(
        'a defect or deferral reference (the as-left is outside limits, so the unit cannot be signed as serviceable)',
      )
    }
  }
  return missing
}

/** Recomputes both readings from the content with this engine, for freezing at signature. */
export function recomputeResults(content: WorksheetContent): WorksheetResults {
  const results: WorksheetResults = {}
  if (content.asFound && content.conditions)
    results.asFound = assess(content, content.asFound.reading, content.conditions.gasTemperature, 'reading')
  if (content.asLeft && content.conditions)
    results.asLeft = assess(content, content.asLeft.reading, content.asLeft.gasTemperature, 'gasTemperature')
  return results
}

export { freezeWorksheetContent, settleUntil } from './worksheet-content'
