import { stationDisplay } from '#shared/utils/station-time'
import { createHash } from 'node:crypto'
import { Op, UniqueConstraintError } from 'sequelize'
import type { OfflineWorksheetBody } from '#shared/schemas/worksheet'
import type { FieldReference, SyncAnswer } from '#shared/types/field'
import type { WorksheetContent, WorksheetObservation, WorksheetResults } from '#shared/types/worksheet'
import { observationOf, STEP_NAMES, StepRefusal } from '#shared/utils/worksheet-steps'
import { appendAudit } from '../database/audit-chain'
import { canonical } from '../database/record-hash'
import { Accumulator, Aircraft, Specification, SpecificationTablePoint, Tool, Worksheet, type User } from '../models'
import { toInstalledUnits } from './accumulators'
import { toSpecificationDto } from './specifications'
import { toToolDto } from './tools'
import {
  checkCorrection,
  claimProblem,
  deviceClockSpanHours,
  draftAttributes,
  frozenContent,
  runStep,
  requireWorksheetInScope,
  unitForNewWorksheet,
  worksheetById,
} from './worksheets'
import { scopeOf, withinScope } from './scope'

/**
 * Work on the ramp with no signal. A technician's device keeps the reference data it needs (their
 * station's aircraft and units, the current specifications, the tools) and fills worksheets with
 * the same step rules the server runs. When the signal returns the device sends each worksheet
 * whole: the server starts it once (by the device's id for it), replays every step at the time the
 * device took it, recomputes every figure, and says plainly what it could not accept — a revised
 * specification, a gauge whose calibration had lapsed — for the technician to review. Nothing is
 * resolved silently, and signing still needs the server.
 */

export async function fieldReference(user: User): Promise<FieldReference> {
  const scope = await scopeOf(user)
  const station = (user.preferences as { stationName?: string }).stationName?.trim() || null
  const atStation = station ? await Aircraft.count({ where: withinScope(scope, { base: station }, 'id') }) : 0
  const units = await Accumulator.findAll({
    where: withinScope(scope, { aircraftId: { [Op.ne]: null }, ...(atStation ? { '$aircraft.base$': station } : {}) }),
    include: [{ model: Aircraft, as: 'aircraft' }],
    order: [
      [{ model: Aircraft, as: 'aircraft' }, 'registration', 'ASC'],
      ['position', 'ASC'],
    ],
  })
  const specifications = await Specification.findAll({
    where: { status: 'current', partNumber: [...new Set(units.map(unit => unit.partNumber))] },
    include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
  })
  const tools = await Tool.findAll({
    where: { active: true },
    order: [
      ['kind', 'DESC'],
      ['assetNumber', 'ASC'],
    ],
  })
  return {
    station: atStation ? station : null,
    units: await toInstalledUnits(units),
    specifications: specifications.map(toSpecificationDto),
    tools: tools.map(toToolDto),
    timeZone: String(useRuntimeConfig().public.stationTimeZone),
    fetchedAt: new Date().toISOString(),
  }
}

/** Every gauge the device chose in its steps. */
function gaugeIdsOf(body: OfflineWorksheetBody): number[] {
  return body.steps.flatMap(step => (step.body.step === 'tools' ? [step.body.gaugeId] : []))
}

/** The steps as the device sent them, in a form that compares equal for the same steps. */
function stepsDigest(body: OfflineWorksheetBody): string {
  return createHash('sha256').update(JSON.stringify(canonical(body.steps))).digest('hex')
}

/**
 * A worksheet this device id already made. The same send again (a lost answer, a second tab) gets the
 * same answer. A send that differs — another unit or work order under the same device id, or steps
 * changed since — is never quietly dropped: a reused id is refused (409, kept on the device), changed
 * steps come back as a conflict saying the server's record stands.
 */
async function answerFor(worksheet: Worksheet, actor: User, body: OfflineWorksheetBody): Promise<SyncAnswer> {
  if (worksheet.performerId !== actor.id) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'Another technician\'s worksheet already carries this device id.',
    })
  }
  await requireWorksheetInScope(actor, worksheet.id)
  if (worksheet.accumulatorId !== body.accumulatorId || worksheet.workOrder !== body.workOrder) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message:
        `This device id already belongs to worksheet ${worksheet.id} (work order ${worksheet.workOrder}, another unit or `
        + 'work order than this one). Nothing was taken from this send: it stays on the device; start it again as a '
        + 'new worksheet.',
    })
  }
  const conflicts = [...(worksheet.content.offline?.conflicts ?? [])]
  const digest = worksheet.content.offline?.stepsDigest
  if (digest && digest !== stepsDigest(body)) {
    const signed = worksheet.state !== 'draft' && worksheet.state !== 'returned'
    conflicts.push(
      `This worksheet reached the server before (worksheet ${worksheet.id}), and the device has changed its steps since: `
      + `the changes were not taken. ${signed ? 'It is signed and can no longer change; record a correction if a reading was wrong.' : 'Make them on the worksheet itself.'}`,
    )
  }
  return { worksheet: await worksheetById(worksheet.id), conflicts, created: false }
}

/**
 * The device's times, bounded by the server's: the start no later than the receipt and not more than
 * the configured span before it; each step between the one before it and the receipt. A time out of
 * bounds is replaced by the nearest bound it may have (the device's claim stays in the timeline) and
 * said in a conflict the technician reviews before signing: never signed as if nothing happened.
 */
function boundedTimes(body: OfflineWorksheetBody, receivedAt: number, conflicts: string[]) {
  const clamp = (time: number, earliest: number) =>
    Number.isNaN(time) ? earliest : Math.min(Math.max(time, earliest), receivedAt)
  const said = (what: string, claim: string, problem: string, used: number) =>
    conflicts.push(
      `The device's clock: ${what} is dated ${Number.isNaN(Date.parse(claim)) ? claim : stationDisplay().dateTime(claim)}, `
      + `which ${problem}. It was taken as ${stationDisplay().dateTime(new Date(used))} `
      + '(the server\'s time); check the device\'s clock and the readings\' times.',
    )
  const startClaim = Date.parse(body.startedAt)
  const startProblem = claimProblem(startClaim, receivedAt, -Infinity)
  const startedAt = startProblem ? clamp(startClaim, receivedAt - deviceClockSpanHours() * 3_600_000) : startClaim
  if (startProblem) said('the start', body.startedAt, startProblem, startedAt)
  let previous = startedAt
  const steps = body.steps.map((step, index) => {
    const claim = Date.parse(step.at)
    const problem = claimProblem(claim, receivedAt, previous - 60_000)
    const at = problem ? clamp(claim, previous) : claim
    if (problem) said(`step ${index + 1} (${STEP_NAMES[step.body.step]})`, step.at, problem, at)
    previous = at
    return { at: new Date(at).toISOString(), claimedAt: step.at }
  })
  return { startedAt: new Date(startedAt).toISOString(), steps }
}

/**
 * Sends a worksheet filled on a device: started once, every step replayed at its time, what could not be
 * accepted reported.
 */
export async function syncOfflineWorksheet(actor: User, body: OfflineWorksheetBody): Promise<SyncAnswer> {
  const known = await Worksheet.findOne({ where: { clientId: body.clientId } })
  if (known) return answerFor(known, actor, body)
  const receivedAt = Date.now()
  const received = new Date(receivedAt).toISOString()
  const unit = await unitForNewWorksheet(body.accumulatorId, actor)
  const { accumulator, aircraft, specification } = unit
  await checkCorrection(actor, body.correctsId, accumulator.id)
  const conflicts: string[] = []
  const times = boundedTimes(body, receivedAt, conflicts)
  if (specification.id !== body.specificationId) {
    const used = await Specification.findByPk(body.specificationId)
    conflicts.push(
      `The specification was revised since the device loaded it (${used ? `rev ${used.revision}` : 'an unknown revision'} → `
      + `rev ${specification.revision}): every figure was worked out again with rev ${specification.revision}. Check the readings against it.`,
    )
  }
  let state: { content: WorksheetContent, results: WorksheetResults } = {
    content: {
      ...frozenContent(accumulator, aircraft, toSpecificationDto(specification)),
      offline: {
        clientId: body.clientId,
        startedAt: times.startedAt,
        syncedAt: received,
        conflicts,
        stepsDigest: stepsDigest(body),
      },
    },
    results: {},
  }
  // Every step is replayed; one the rules refuse is kept on the record as observed (a reading cannot be taken
  // again), and so is every step that needed it. The steps that stand on their own still count.
  const observations: WorksheetObservation[] = []
  const gauges = new Map((await Tool.findAll({ where: { id: gaugeIdsOf(body) } })).map(tool => [tool.id, tool]))
  let gaugeId: number | undefined
  let first: { step: string, reason: string } | undefined
  for (const [index, step] of body.steps.entries()) {
    if (step.body.step === 'tools') gaugeId = step.body.gaugeId
    const time = { ...times.steps[index]!, receivedAt: received }
    try {
      state = await runStep(state, step.body, time)
    }
    catch (error) {
      if (!(error instanceof StepRefusal)) throw error
      const reason = first && error.status === 409
        ? `Taken after the ${first.step} step was refused, and it cannot count without that step. ${first.reason}`
        : error.message
      first ??= { step: STEP_NAMES[step.body.step], reason: error.message }
      const gauge = gaugeId === undefined ? undefined : gauges.get(gaugeId)
      const inHand = gauge && { id: gauge.id, assetNumber: gauge.assetNumber }
      observations.push(observationOf(step.body, time, reason, inHand))
    }
  }
  if (first) {
    const redo = [...new Set(observations.map(observation => STEP_NAMES[observation.step as keyof typeof STEP_NAMES]))]
    conflicts.push(
      `${first.step} was not accepted: ${first.reason} What was entered for ${redo.join(', ')} is kept on the record as `
      + `observed, with its time and why it does not count. Redo ${redo.length === 1 ? 'that step' : 'those steps'}: `
      + `${redo.join(', ')}.`,
    )
    state.content = { ...state.content, observations }
  }
  // Each step works on a copy of the content: the record keeps every conflict found on the way.
  state.content = { ...state.content, offline: { ...state.content.offline!, conflicts: [...conflicts] } }
  try {
    const id = await writeTransaction(async (transaction) => {
      const created = await Worksheet.create(
        draftAttributes(actor, unit, body, {
          ...state,
          performedAt: new Date(times.startedAt),
          clientId: body.clientId,
        }),
        { transaction },
      )
      await appendAudit(
        {
          actorId: actor.id,
          entity: 'worksheet',
          entityId: String(created.id),
          action: 'synced-from-device',
          detail: { clientId: body.clientId, startedAt: body.startedAt, steps: body.steps.length, conflicts },
        },
        transaction,
      )
      return created.id
    })
    return { worksheet: await worksheetById(id), conflicts, created: true }
  }
  catch (error) {
    // The same worksheet sent twice at once: the first one made it.
    if (!(error instanceof UniqueConstraintError)) throw error
    return answerFor((await Worksheet.findOne({ where: { clientId: body.clientId } }))!, actor, body)
  }
}
