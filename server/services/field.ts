import { Op, UniqueConstraintError } from 'sequelize'
import type { OfflineWorksheetBody } from '#shared/schemas/worksheet'
import type { FieldReference, SyncAnswer } from '#shared/types/field'
import type { WorksheetContent, WorksheetResults } from '#shared/types/worksheet'
import { STEP_NAMES, StepRefusal } from '#shared/utils/worksheet-steps'
import { appendAudit } from '../database/audit-chain'
import { Accumulator, Aircraft, Specification, SpecificationTablePoint, Tool, Worksheet, type User } from '../models'
import { toInstalledUnits } from './accumulators'
import { unprocessable } from './records'
import { toSpecificationDto } from './specifications'
import { toToolDto } from './tools'
import { checkCorrection, draftAttributes, frozenContent, runStep, stepTime, unitToService, worksheetById } from './worksheets'

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
  const station = (user.preferences as { stationName?: string }).stationName?.trim() || null
  const atStation = station ? await Aircraft.count({ where: { base: station } }) : 0
  const units = await Accumulator.findAll({
    where: { aircraftId: { [Op.ne]: null }, ...(atStation ? { '$aircraft.base$': station } : {}) },
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

async function answerFor(worksheet: Worksheet, actor: User): Promise<SyncAnswer> {
  if (worksheet.performerId !== actor.id) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'Another technician\'s worksheet already carries this device id.',
    })
  }
  return {
    worksheet: await worksheetById(worksheet.id),
    conflicts: worksheet.content.offline?.conflicts ?? [],
    created: false,
  }
}

/** Steps dated as the device took them: each not in the future, none before the start or the step before. */
function checkTimes(body: OfflineWorksheetBody): void {
  const now = Date.now()
  let previous = Date.parse(body.startedAt)
  if (previous > now + 120_000)
    unprocessable('The worksheet is dated in the future: check the device\'s clock.', 'startedAt')
  body.steps.forEach((step, index) => {
    const at = Date.parse(step.at)
    if (at > now + 120_000)
      unprocessable('This step is dated in the future: check the device\'s clock.', `steps.${index}.at`)
    if (at < previous - 60_000)
      unprocessable('This step is dated before the one before it: check the device\'s clock.', `steps.${index}.at`)
    previous = at
  })
}

/**
 * Sends a worksheet filled on a device: started once, every step replayed at its time, what could not be
 * accepted reported.
 */
export async function syncOfflineWorksheet(actor: User, body: OfflineWorksheetBody): Promise<SyncAnswer> {
  const known = await Worksheet.findOne({ where: { clientId: body.clientId } })
  if (known) return answerFor(known, actor)
  checkTimes(body)
  const unit = await unitToService(body.accumulatorId)
  const { accumulator, aircraft, specification } = unit
  await checkCorrection(actor, body.correctsId, accumulator.id)
  const conflicts: string[] = []
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
      offline: { clientId: body.clientId, startedAt: body.startedAt, syncedAt: new Date().toISOString(), conflicts },
    },
    results: {},
  }
  for (const [index, step] of body.steps.entries()) {
    try {
      state = await runStep(state, step.body, stepTime(state.content, step.at, `steps.${index}.at`))
    }
    catch (error) {
      if (!(error instanceof StepRefusal)) throw error
      const left = body.steps.length - index - 1
      conflicts.push(
        `${STEP_NAMES[step.body.step]} was not accepted: ${error.message}`
        + (left ? ` The ${left} step(s) after it were not taken either: do them again.` : ' Do it again.'),
      )
      break
    }
  }
  // Each step works on a copy of the content: the record keeps every conflict found on the way.
  state.content = { ...state.content, offline: { ...state.content.offline!, conflicts: [...conflicts] } }
  try {
    const id = await writeTransaction(async (transaction) => {
      const created = await Worksheet.create(
        draftAttributes(actor, unit, body, {
          ...state,
          performedAt: new Date(body.startedAt),
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
    return answerFor((await Worksheet.findOne({ where: { clientId: body.clientId } }))!, actor)
  }
}
