import { Op, UniqueConstraintError, type InferCreationAttributes, type Transaction } from 'sequelize'
import type { WorksheetCreateBody, WorksheetStepBody } from '../../shared/schemas/worksheet'
import { INSPECTOR_STATEMENT, PERFORMER_STATEMENT, WORKSHEET_STATE_LABELS, type WorksheetContent, type WorksheetResults, type WorksheetState } from '../../shared/types/worksheet'
import { canCorrect, canDiscard, canEdit, canInspect, canVoid, EDITABLE_STATES } from '../../shared/utils/worksheet-rules'
import { appendAudit } from '../database/audit-chain'
import { Accumulator, Aircraft, Signature, Specification, SpecificationTablePoint, User as UserModel, Worksheet, listColumns, type User } from '../models'
import { mailAlerts, trendAfterRelease, trendAfterVoid } from './trends'

/**
 * The worksheet's life: start, steps, sign, countersign, return, void. Every change is one
 * compare-and-set inside the single writer's transaction: the update names the row version
 * (and the states) it expects, and a request that lost a race gets 409 with a plain reason.
 * Signatures are unique per round in the database itself, so a second performer or inspector
 * signature for the same round cannot be written whatever the interleaving.
 */

interface Actor { id: number, name: string, roles: User['roles'], authorisationNumber: string | null }

function conflict(message: string): never {
  throw createError({ status: 409, statusMessage: 'Conflict', message })
}

/** The version a client says it saw (If-Match) must be the current one. */
function checkVersion(worksheet: Worksheet, expected: number | undefined): void {
  if (expected !== undefined && expected !== worksheet.version) {
    conflict(`Worksheet ${worksheet.id} has changed since you opened it (it is now ${WORKSHEET_STATE_LABELS[worksheet.state].toLowerCase()}). Reload it and check it again before going on.`)
  }
}

/**
 * Moves the row from the version read to the next, only if it is still at that version and in
 * one of `from`; anything else means another request got there first.
 */
async function compareAndSet(worksheet: Worksheet, from: readonly WorksheetState[], changes: Partial<Worksheet>, transaction: Transaction): Promise<void> {
  // A static update runs no model hooks: keep the list's columns in step here.
  const derived = changes.content || changes.results ? listColumns(changes.content ?? worksheet.content, changes.results ?? worksheet.results) : {}
  const [updated] = await Worksheet.update({ ...changes, ...derived, version: worksheet.version + 1 }, {
    where: { id: worksheet.id, version: worksheet.version, state: { [Op.in]: [...from] } },
    transaction,
  })
  if (updated !== 1) {
    const now = await Worksheet.findByPk(worksheet.id, { attributes: ['state'], transaction })
    conflict(`Someone else changed worksheet ${worksheet.id} a moment ago (it is now ${now ? WORKSHEET_STATE_LABELS[now.state].toLowerCase() : 'gone'}); your change was not made. Reload to see it.`)
  }
}

async function signOnce(fields: Omit<InferCreationAttributes<Signature>, 'id'>, transaction: Transaction): Promise<void> {
  try {
    await Signature.create(fields, { transaction })
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) conflict('This worksheet already carries that signature for this round; it was not signed twice.')
    throw error
  }
}

async function lockedWorksheet(id: number, transaction: Transaction): Promise<Worksheet> {
  const worksheet = await Worksheet.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!worksheet) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Worksheet not found.' })
  return worksheet
}

const audit = (actor: Actor, worksheet: Worksheet, action: string, detail: Record<string, unknown>, transaction: Transaction, at?: Date) =>
  appendAudit({ at, actorId: actor.id, entity: 'worksheet', entityId: String(worksheet.id), action, detail }, transaction)

/** Starts a worksheet for an installed unit, freezing its current specification; a correction points at a released one. */
export async function startWorksheet(actor: Actor, body: WorksheetCreateBody): Promise<number> {
  const accumulator = await Accumulator.findByPk(body.accumulatorId, { include: [{ model: Aircraft, as: 'aircraft' }] })
  if (!accumulator?.aircraft) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'That accumulator is not installed on an aircraft.', data: { field: 'accumulatorId' } })
  const specification = await Specification.findOne({ where: { partNumber: accumulator.partNumber, status: 'current' }, include: [{ model: SpecificationTablePoint, as: 'tablePoints' }] })
  if (!specification) {
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `There is no current specification for P/N ${accumulator.partNumber}. Ask engineering; do not service from memory.`, data: { field: 'accumulatorId' } })
  }
  if (body.correctsId) {
    const corrected = await Worksheet.findByPk(body.correctsId)
    if (!corrected) throw createError({ status: 404, statusMessage: 'Not Found', message: 'The worksheet to correct was not found.' })
    enforce(canCorrect(actor, corrected))
    if (corrected.accumulatorId !== accumulator.id) {
      throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'A correction must be for the same accumulator as the worksheet it corrects.', data: { field: 'accumulatorId' } })
    }
  }
  const { status: _status, ...frozen } = toSpecificationDto(specification)
  const aircraft = accumulator.aircraft
  const content: WorksheetContent = {
    specification: frozen,
    aircraft: { id: aircraft.id, registration: aircraft.registration, fleetNumber: aircraft.fleetNumber, type: aircraft.type },
    accumulator: { id: accumulator.id, partNumber: accumulator.partNumber, serialNumber: accumulator.serialNumber, position: accumulator.position ?? '' },
  }
  return writeTransaction(async (transaction) => {
    const created = await Worksheet.create({
      state: 'draft', accumulatorId: accumulator.id, aircraftId: aircraft.id, specificationId: specification.id, performerId: actor.id,
      correctsId: body.correctsId ?? null, workOrder: body.workOrder, reason: body.reason, content: content as unknown as Record<string, unknown>,
      results: {}, engineVersion: ENGINE_VERSION, serviceable: null, returnReason: null, voidReason: null, voidedById: null,
      performedAt: new Date(), submittedAt: null, releasedAt: null,
    }, { transaction })
    const specificationLabel = `${specification.partNumber} rev ${specification.revision}`
    await audit(actor, created, body.correctsId ? 'correction-started' : 'started', { correctsId: body.correctsId ?? null, specification: specificationLabel }, transaction)
    return created.id
  })
}

/** Saves one completed step: the server recomputes every figure from the frozen specification. */
export async function saveStep(actor: Actor, id: number, step: WorksheetStepBody, expectedVersion?: number): Promise<void> {
  await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canEdit(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    const { content, results } = await applyStep(worksheet, step)
    await compareAndSet(worksheet, EDITABLE_STATES, {
      content: content as unknown as Record<string, unknown>, results: results as Record<string, unknown>, engineVersion: ENGINE_VERSION,
    }, transaction)
    await audit(actor, worksheet, 'step-saved', { step: step.step }, transaction)
  })
}

/** The performer signs: results recomputed and frozen, state to awaiting countersign. */
/** The signer as the database holds them now: a signature never carries a name or authorisation from a cache. */
async function signer(actor: Actor): Promise<Actor & { passwordHash: string }> {
  const fresh = await UserModel.findByPk(actor.id)
  if (!fresh || fresh.disabled) throw createError({ status: 401, statusMessage: 'Unauthorized', message: 'Your account is no longer active; the signature was not made.' })
  return fresh
}

export async function signWorksheet(cachedActor: Actor, id: number, password: string, expectedVersion?: number): Promise<Worksheet> {
  const actor = await signer(cachedActor)
  const seen = await findWorksheet(id)
  enforce(canEdit(actor, seen))
  checkVersion(seen, expectedVersion)
  // The password is checked outside the write lock (it takes tens of milliseconds on purpose).
  await confirmPassword(actor, password)
  const content = seen.content as unknown as WorksheetContent
  const results: WorksheetResults = recomputeResults(content)
  const missing = missingForSignature(content, results)
  if (missing.length) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `Not ready to sign. Still needed: ${missing.join('; ')}.`, data: { missing } })
  const now = new Date()
  const serviceable = results.asLeft!.assessment.verdict === 'in-limits'
  await writeTransaction(async (transaction) => {
    // Signed as seen: the version whose content was just checked, or the request loses.
    await compareAndSet(seen, EDITABLE_STATES, {
      state: 'awaiting-countersign', results: results as Record<string, unknown>, engineVersion: ENGINE_VERSION, serviceable, submittedAt: now, returnReason: null,
    }, transaction)
    await signOnce({
      worksheetId: seen.id, userId: actor.id, capacity: 'performer', name: actor.name, authorisationNumber: actor.authorisationNumber,
      statement: PERFORMER_STATEMENT, signedAt: now, round: seen.round,
    }, transaction)
    await audit(actor, seen, 'signed', { engineVersion: ENGINE_VERSION, serviceable, round: seen.round }, transaction, now)
  })
  return seen
}

/** Independent inspection: an inspector who did not do the work countersigns, and the record is released. */
export async function countersignWorksheet(cachedActor: Actor, id: number, password: string, expectedVersion?: number): Promise<void> {
  const actor = await signer(cachedActor)
  const seen = await findWorksheet(id)
  enforce(canInspect(actor, seen))
  checkVersion(seen, expectedVersion)
  await confirmPassword(actor, password)
  const now = new Date()
  const alerts = await writeTransaction(async (transaction) => {
    await compareAndSet(seen, ['awaiting-countersign'], { state: 'released', releasedAt: now }, transaction)
    await signOnce({
      worksheetId: seen.id, userId: actor.id, capacity: 'inspector', name: actor.name, authorisationNumber: actor.authorisationNumber,
      statement: INSPECTOR_STATEMENT, signedAt: now, round: seen.round,
    }, transaction)
    await audit(actor, seen, 'countersigned', { performerId: seen.performerId, round: seen.round }, transaction, now)
    // The released as-found joins its unit's trend, in the same write.
    return trendAfterRelease(seen, transaction)
  })
  await mailAlerts(alerts)
}

/** Back to the performer with a reason; the next signature opens a new round. */
export async function returnWorksheet(actor: Actor, id: number, reason: string, expectedVersion?: number): Promise<Worksheet> {
  return writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canInspect(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    await compareAndSet(worksheet, ['awaiting-countersign'], { state: 'returned', returnReason: reason, submittedAt: null, round: worksheet.round + 1 }, transaction)
    await audit(actor, worksheet, 'returned', { reason, round: worksheet.round }, transaction)
    return worksheet
  })
}

/** Voided with a reason: the record stays, readable, marked voided. */
export async function voidWorksheet(actor: Actor, id: number, reason: string, expectedVersion?: number): Promise<void> {
  const alerts = await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canVoid(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    const previousState = worksheet.state
    await compareAndSet(worksheet, ['draft', 'awaiting-countersign', 'released', 'returned'], { state: 'voided', voidReason: reason, voidedById: actor.id }, transaction)
    await audit(actor, worksheet, 'voided', { reason, previousState }, transaction)
    return trendAfterVoid(worksheet, previousState, transaction)
  })
  await mailAlerts(alerts)
}

/** The performer discards a draft that was never signed: kept, marked voided, with the reason. */
export async function discardWorksheet(actor: Actor, id: number, reason: string, expectedVersion?: number): Promise<void> {
  await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canDiscard(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    const voidReason = `Discarded by the performer before signing${reason ? `: ${reason}` : '.'}`
    await compareAndSet(worksheet, ['draft'], { state: 'voided', voidReason, voidedById: actor.id }, transaction)
    await audit(actor, worksheet, 'discarded', { reason }, transaction)
  })
}
