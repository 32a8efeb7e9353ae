import type { AuthenticationResponseJSON } from '@simplewebauthn/types'
import type { H3Event } from 'h3'
import { Op, type Transaction } from 'sequelize'
import { ENGINE_VERSION } from '#shared/gas/version'
import type { WorksheetCreateBody, WorksheetStepBody } from '#shared/schemas/worksheet'
import type { SigningOptionsDto } from '#shared/types/signing'
import {
  WORKSHEET_STATE_LABELS,
  type SignatureCapacity,
  type WorksheetContent,
  type WorksheetDto,
  type WorksheetState,
} from '#shared/types/worksheet'
import {
  canCorrect,
  canDiscard,
  canEdit,
  canInspect,
  canVoid,
  EDITABLE_STATES,
  type Decision,
} from '#shared/utils/worksheet-rules'
import {
  applyStep,
  missingForSignature,
  observationOf,
  recomputeResults,
  settleUntil,
  StepRefusal,
  type StepTool,
} from '#shared/utils/worksheet-steps'
import { stationDate } from '#shared/utils/station-time'
import { appendAudit } from '../database/audit-chain'
import { challengeOf, keyFingerprint, type SignedRecordSource } from '#shared/utils/record-proof'
import { Accumulator, Aircraft, Attachment, Passkey, Signature, Tool, User, Worksheet, listColumns } from '../models'
import { askForCountersign, mailAlerts, tellReturned } from './notifications'
import { announceRecord } from './webhooks'
import { notFound, unprocessable } from './audited-writes'
import { authorisationToSign, frozenAuthorisation } from './authorisations'
import { signingRequestOptions, verifySigningAssertion } from './passkeys'
import { signingPolicy } from './signing-policy'
import { confirmSigner, createSignature, currentSigner, signingMethod, signingProof, type SignedAs } from './signatures'
import { scopeOf, seesAircraft, stationNamed, WHOLE_ORGANISATION, type Scope } from './scope'
import { currentSpecification, toSpecificationDto } from './specifications'
import { trendAfterCorrection, trendAfterRelease, trendAfterVoid } from './trends'

/**
 * The worksheet's life: start, steps, sign, countersign, return, void, discard. Every change is
 * one compare-and-set inside the single writer's transaction: the update names the row version
 * (and the states) it expects, and a request that lost a race gets 409 with a plain reason. The
 * steps' rules are shared with the pages (shared/utils/worksheet-steps.ts); the server runs them
 * again on every save and recomputes every figure. Each action answers the worksheet as it now is.
 */

type Actor = Pick<User, 'id' | 'name' | 'roles' | 'authorisationNumber' | 'stationIds' | 'operatorIds'>

/** The request a signature comes with, and the signer's proof: the password re-entered, or a passkey's assertion. */
export interface SignerProof {
  event: H3Event
  password?: string
  passkey?: AuthenticationResponseJSON
}

/** Throws a rule's refusal as an HTTP error (403 or 409 with the reason). */
export function enforce(decision: Decision): void {
  if (!decision.allowed)
    throw createError({
      status: decision.status,
      statusMessage: decision.status === 409 ? 'Conflict' : 'Forbidden',
      message: decision.reason,
    })
}

function conflict(message: string): never {
  throw createError({ status: 409, statusMessage: 'Conflict', message })
}

/** A step refused by the shared rules, as the API answers it: the reason on the field it names. */
function asHttpError(refusal: StepRefusal, more: Record<string, unknown> = {}) {
  const field = refusal.field
  const data = field
    ? { field, issues: [{ path: field.split('.'), field, message: refusal.message }], ...refusal.extra, ...more }
    : more
  return createError({
    status: refusal.status,
    statusMessage: refusal.status === 409 ? 'Conflict' : 'Unprocessable Entity',
    message: refusal.message,
    data: Object.keys(data).length ? data : undefined,
  })
}

/**
 * 404 unless the worksheet is of an aircraft the actor may see (server/services/scope.ts): every action
 * on a worksheet asks this first, so a worksheet out of scope reads, signs and changes as not there.
 */
export async function requireWorksheetInScope(scope: Scope | Pick<User, 'roles' | 'stationIds' | 'operatorIds'>, id: number): Promise<void> {
  const resolved = 'whole' in scope ? scope : await scopeOf(scope)
  if (resolved.aircraftIds === null) return
  const row = await Worksheet.findByPk(id, { attributes: ['id', 'aircraftId'] })
  if (!row || !seesAircraft(resolved, row.aircraftId)) notFound('Worksheet')
}

export async function findWorksheet(id: number, transaction?: Transaction): Promise<Worksheet> {
  const worksheet = await Worksheet.findByPk(id, {
    include: [
      { model: Signature, as: 'signatures', include: [{ model: Passkey, as: 'passkey' }] },
      { model: Attachment, as: 'attachments' },
      { model: User, as: 'performer', attributes: ['id', 'name'] },
    ],
    transaction,
  })
  return worksheet ?? notFound('Worksheet')
}

/** The station an aircraft is based at: its name and time zone. */
async function stationOfAircraft(aircraftId: number): Promise<{ name: string, timeZone: string } | null> {
  const aircraft = await Aircraft.findByPk(aircraftId, { attributes: ['base'] })
  const station = await stationNamed(aircraft?.base)
  return station ? { name: station.name, timeZone: station.timeZone } : null
}

export async function toWorksheetDto(worksheet: Worksheet): Promise<WorksheetDto> {
  const correctedBy = await Worksheet.findAll({ where: { correctsId: worksheet.id }, attributes: ['id'] })
  const performer = (worksheet as Worksheet & { performer?: User }).performer
  const attachments = (worksheet as Worksheet & { attachments?: Attachment[] }).attachments ?? []
  const signatures = [...(worksheet.signatures ?? [])].sort(
    (a, b) => a.signedAt.getTime() - b.signedAt.getTime() || a.id - b.id,
  )
  const iso = (date: Date | null) => date?.toISOString() ?? null
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
    content: worksheet.content,
    results: worksheet.results,
    engineVersion: worksheet.engineVersion,
    serviceable: worksheet.serviceable,
    returnReason: worksheet.returnReason,
    voidReason: worksheet.voidReason,
    performedAt: iso(worksheet.performedAt),
    submittedAt: iso(worksheet.submittedAt),
    releasedAt: iso(worksheet.releasedAt),
    createdAt: worksheet.createdAt.toISOString(),
    updatedAt: worksheet.updatedAt.toISOString(),
    signatures: signatures.map(signature => ({
      capacity: signature.capacity,
      name: signature.name,
      authorisationNumber: signature.authorisationNumber,
      statement: signature.statement,
      signedAt: signature.signedAt.toISOString(),
      round: signature.round,
      method: signature.method ?? null,
      keyFingerprint: signature.passkey ? keyFingerprint(signature.passkey.publicKey) : null,
    })),
    attachments: attachments.map(({ id, kind, originalName, mimeType, sizeBytes, sha256 }) => ({
      id,
      kind,
      originalName,
      mimeType,
      sizeBytes,
      sha256,
    })),
    settleUntil: settleUntil(worksheet.content),
    station: await stationOfAircraft(worksheet.aircraftId),
  }
}

/** The worksheet as the API answers it (404 outside the user's scope). */
export async function worksheetById(id: number, scope: Scope = WHOLE_ORGANISATION): Promise<WorksheetDto> {
  await requireWorksheetInScope(scope, id)
  return toWorksheetDto(await findWorksheet(id))
}

/** The answer with the row version as its ETag (sent back as If-Match). */
export function versioned(event: H3Event, worksheet: WorksheetDto): WorksheetDto {
  setVersionTag(event, worksheet.version)
  return worksheet
}

/** The version a client says it saw (If-Match) must be the current one. */
function checkVersion(worksheet: Worksheet, expected: number | undefined): void {
  if (expected === undefined || expected === worksheet.version) return
  conflict(
    `Worksheet ${worksheet.id} has changed since you opened it (it is now ${WORKSHEET_STATE_LABELS[worksheet.state].toLowerCase()}). `
    + 'Reload it and check it again before going on.',
  )
}

/** Moves the row from the version read to the next, only if it is still at that version and in one of `from`. */
async function compareAndSet(
  worksheet: Worksheet,
  from: readonly WorksheetState[],
  changes: Partial<Worksheet>,
  transaction: Transaction,
): Promise<void> {
  // A static update runs no model hooks: keep the list's columns in step here.
  const derived
    = changes.content || changes.results
      ? listColumns(changes.content ?? worksheet.content, changes.results ?? worksheet.results)
      : {}
  const [updated] = await Worksheet.update(
    { ...changes, ...derived, version: worksheet.version + 1 },
    {
      where: { id: worksheet.id, version: worksheet.version, state: { [Op.in]: [...from] } },
      transaction,
    },
  )
  if (updated === 1) return
  const now = await Worksheet.findByPk(worksheet.id, { attributes: ['state'], transaction })
  conflict(
    `Someone else changed worksheet ${worksheet.id} a moment ago (it is now ${now ? WORKSHEET_STATE_LABELS[now.state].toLowerCase() : 'gone'}); `
    + 'your change was not made. Reload to see it.',
  )
}

async function lockedWorksheet(id: number, transaction: Transaction): Promise<Worksheet> {
  return (await Worksheet.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })) ?? notFound('Worksheet')
}

const audit = (
  actor: Pick<User, 'id'>,
  worksheet: Worksheet,
  action: string,
  detail: Record<string, unknown>,
  transaction: Transaction,
  at?: Date,
) =>
  appendAudit(
    { at, actorId: actor.id, entity: 'worksheet', entityId: String(worksheet.id), action, detail },
    transaction,
  )

/** What a worksheet freezes of its unit: the aircraft, the unit, and the specification in force. */
export const frozenContent = freezeWorksheetContent

/**
 * The unit, its aircraft and its specification in force, or 422 naming what is missing. A unit on an aircraft
 * the actor may not see is answered as one not installed: its existence is not given away.
 */
export async function unitForNewWorksheet(accumulatorId: number, actor: Pick<User, 'roles' | 'stationIds' | 'operatorIds'>) {
  const accumulator = await Accumulator.findByPk(accumulatorId, { include: [{ model: Aircraft, as: 'aircraft' }] })
  if (!accumulator?.aircraft || !seesAircraft(await scopeOf(actor), accumulator.aircraft.id))
    unprocessable('That accumulator is not installed on an aircraft.', 'accumulatorId')
  const specification = await currentSpecification(accumulator.partNumber)
  if (!specification)
    unprocessable(
      `There is no current specification for P/N ${accumulator.partNumber}. Ask engineering; do not service from memory.`,
      'accumulatorId',
    )
  return { accumulator, aircraft: accumulator.aircraft, specification }
}

/** A correction may be started by whom the rules allow, of a released worksheet, for the same unit. */
export async function checkCorrection(actor: Actor, correctsId: number | undefined, accumulatorId: number) {
  if (!correctsId) return
  const corrected = (await Worksheet.findByPk(correctsId)) ?? notFound('The worksheet to correct')
  enforce(canCorrect(actor, corrected))
  if (corrected.accumulatorId !== accumulatorId)
    unprocessable('A correction must be for the same accumulator as the worksheet it corrects.', 'accumulatorId')
}

/** A new draft's row: the unit, its aircraft and specification frozen, nothing signed. */
export function draftAttributes(
  actor: Actor,
  { accumulator, aircraft, specification }: Awaited<ReturnType<typeof unitForNewWorksheet>>,
  body: WorksheetCreateBody,
  state: { content: WorksheetContent, results: WorksheetResults, performedAt: Date, clientId?: string },
) {
  return {
    state: 'draft' as const,
    accumulatorId: accumulator.id,
    aircraftId: aircraft.id,
    specificationId: specification.id,
    performerId: actor.id,
    correctsId: body.correctsId ?? null,
    workOrder: body.workOrder,
    reason: body.reason,
    engineVersion: ENGINE_VERSION,
    serviceable: null,
    returnReason: null,
    voidReason: null,
    voidedById: null,
    submittedAt: null,
    releasedAt: null,
    clientId: null,
    ...state,
  }
}

/** Starts a worksheet for an installed unit, freezing its specification; a correction points at a released one. */
export async function startWorksheet(actor: Actor, body: WorksheetCreateBody): Promise<WorksheetDto> {
  const unit = await unitForNewWorksheet(body.accumulatorId, actor)
  const { accumulator, aircraft, specification } = unit
  await checkCorrection(actor, body.correctsId, accumulator.id)
  const id = await writeTransaction(async (transaction) => {
    const content = frozenContent(accumulator, aircraft, toSpecificationDto(specification))
    const created = await Worksheet.create(
      draftAttributes(actor, unit, body, { content, results: {}, performedAt: new Date() }),
      { transaction },
    )
    const label = `${specification.partNumber} rev ${specification.revision}`
    await audit(
      actor,
      created,
      body.correctsId ? 'correction-started' : 'started',
      { correctsId: body.correctsId ?? null, specification: label },
      transaction,
    )
    return created.id
  })
  return worksheetById(id)
}

/** The tools a step names, read from the register for the shared rules. */
async function toolsFor(content: WorksheetContent, step: WorksheetStepBody): Promise<Map<number, StepTool>> {
  const ids = step.step === 'tools' ? [step.gaugeId, step.cartId] : content.tools ? [content.tools.gauge.id] : []
  const tools = await Tool.findAll({ where: { id: { [Op.in]: ids } } })
  return new Map(tools.map(tool => [tool.id, tool.get({ plain: true })]))
}

/**
 * Runs the shared step rules with the tool register. The step's time is `time.at`: the server's
 * receipt, or the device's claim where it gave one and the claim is within bounds (`claimedStepTime`).
 * The calibration of the tools is judged on the station's date at the later of the two, so a claimed
 * time can never make an expired gauge acceptable. The receipt (and the claim) join the record's
 * timeline. A refusal is thrown as the shared rules' StepRefusal.
 */
export async function runStep(
  worksheet: Pick<Worksheet, 'content' | 'results'>,
  step: WorksheetStepBody,
  time: { at: string, receivedAt: string, claimedAt?: string },
) {
  const tools = await toolsFor(worksheet.content, step)
  const later = new Date(Math.max(Date.parse(time.at), Date.parse(time.receivedAt))).toISOString()
  const today = stationDate(String(useRuntimeConfig().public.stationTimeZone), later)
  const next = applyStep(worksheet, step, { now: time.at, today, tool: id => tools.get(id) })
  const claim = time.claimedAt ? { claimedAt: time.claimedAt } : {}
  const receipt = { step: step.step, receivedAt: time.receivedAt, ...claim }
  next.content.timeline = [...(worksheet.content.timeline ?? []), receipt]
  return next
}

/** Latest time a step already in the worksheet carries, for checking a device's step times. */
function lastStepTime(content: WorksheetContent): number {
  const times = [
    ...Object.values(content.preparation ?? {}),
    content.asFound?.recordedAt,
    content.action?.recordedAt,
    content.asLeft?.recordedAt,
    content.finish?.recordedAt,
    content.offline?.startedAt,
  ].filter((time): time is string => !!time)
  return Math.max(0, ...times.map(time => Date.parse(time)))
}

/** Clocks of devices and server disagree by this much without it meaning anything. */
const CLOCK_GRACE_MS = 120_000
const ORDER_GRACE_MS = 60_000

/** How long before it reaches the server a device may say a step was taken (NUXT_DEVICE_CLOCK_SPAN_HOURS). */
export function deviceClockSpanHours(): number {
  return Number(useRuntimeConfig().deviceClockSpanHours) || 72
}

/**
 * The earliest time a device may claim for the next step: not before the steps already recorded
 * and, for a worksheet started on the server, not before the server started it.
 */
export function earliestClaim(content: WorksheetContent, startedOnServerAt?: Date | null): number {
  return Math.max(lastStepTime(content), content.offline ? 0 : (startedOnServerAt?.getTime() ?? 0)) - ORDER_GRACE_MS
}

/** What is wrong with a time a device claims for a step, in words, or null when it is within bounds. */
export function claimProblem(claim: number, receivedAt: number, earliest: number): string | null {
  const span = deviceClockSpanHours()
  if (Number.isNaN(claim)) return 'is not a date'
  if (claim > receivedAt + CLOCK_GRACE_MS) return 'is later than the moment the server received it'
  if (claim < receivedAt - span * 3_600_000) return `is more than ${span} hours before the server received it`
  if (claim < earliest) return 'is before the steps already recorded (or before the worksheet was started)'
  return null
}

/**
 * When an online step was taken: the server's receipt; or, for a step a device kept while it had no
 * signal (`x-taken-at`), the device's claim when it is within bounds — else 422, not counted (the step
 * is kept on the record as observed, by `saveStep`).
 */
export function claimedStepTime(
  worksheet: Pick<Worksheet, 'content' | 'createdAt'>,
  takenAt: string | undefined,
  field = 'x-taken-at',
): { at: string, receivedAt: string, claimedAt?: string } {
  const receivedAt = Date.now()
  const received = new Date(receivedAt).toISOString()
  if (!takenAt) return { at: received, receivedAt: received }
  const claim = Date.parse(takenAt)
  const problem = claimProblem(claim, receivedAt, earliestClaim(worksheet.content, worksheet.createdAt))
  if (problem) {
    throw new DeviceTimeRefusal(
      `The time this device gives for the step (${takenAt}) ${problem}. It was not counted: check the device's clock `
      + 'and take the step again.',
      field,
      { at: received, receivedAt: received, claimedAt: takenAt },
    )
  }
  const claimed = new Date(claim).toISOString()
  return { at: claimed, receivedAt: received, claimedAt: claimed }
}

/** A device's time for a step that is out of bounds: refused (422) with the receipt, to keep what was read. */
class DeviceTimeRefusal extends StepRefusal {
  constructor(message: string, field: string, readonly time: { at: string, receivedAt: string, claimedAt: string }) {
    super(message, field, 422)
  }
}

/**
 * Saves one completed step: the server recomputes every figure from the frozen specification. A step a
 * device kept while it had no signal (`takenAt`) that the rules refuse now is still an observation made
 * at the unit: it is kept on the record as observed, with its time, the gauge in hand and the reason,
 * and the refusal is answered as usual (with `keptAsObservation`) for the technician to redo the step.
 */
export async function saveStep(
  actor: Actor,
  id: number,
  step: WorksheetStepBody,
  expectedVersion?: number,
  takenAt?: string,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  const refusal = await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canEdit(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    let time = { at: '', receivedAt: '' } as ReturnType<typeof claimedStepTime>
    let next
    try {
      time = claimedStepTime(worksheet, takenAt)
      next = await runStep(worksheet, step, time)
    }
    catch (error) {
      if (!(error instanceof StepRefusal)) throw error
      if (!takenAt) throw asHttpError(error)
      // A time out of bounds keeps the reading too, at the server's receipt with the device's claim beside it.
      if (error instanceof DeviceTimeRefusal) time = error.time
      const observation = observationOf(step, time, error.message, await gaugeInHand(worksheet.content, step))
      await compareAndSet(
        worksheet,
        EDITABLE_STATES,
        { content: { ...worksheet.content, observations: [...(worksheet.content.observations ?? []), observation] } },
        transaction,
      )
      await audit(actor, worksheet, 'observation-kept', { step: step.step, deviceClaimedAt: time.claimedAt, reason: error.message }, transaction)
      return error
    }
    await compareAndSet(
      worksheet,
      EDITABLE_STATES,
      { content: next.content, results: next.results, engineVersion: ENGINE_VERSION },
      transaction,
    )
    await audit(actor, worksheet, 'step-saved', { step: step.step, ...(time.claimedAt ? { deviceClaimedAt: time.claimedAt } : {}) }, transaction)
    return null
  })
  if (refusal) throw asHttpError(refusal, { keptAsObservation: true })
  return worksheetById(id)
}

/**
 * The gauge a step was taken with: the one it names; else the one the worksheet holds, or the one chosen in a
 * tools step kept as observed (the device went on with it).
 */
async function gaugeInHand(content: WorksheetContent, step: WorksheetStepBody) {
  if (step.step !== 'tools') {
    const held = content.tools?.gauge ?? [...(content.observations ?? [])].reverse().find(kept => kept.step === 'tools')?.gauge
    return held ? { id: held.id, assetNumber: held.assetNumber } : undefined
  }
  const tool = await Tool.findByPk(step.gaugeId)
  return tool ? { id: tool.id, assetNumber: tool.assetNumber } : undefined
}

/** The results a signature freezes, recomputed now with this engine; 422 naming what is still missing. */
function resultsToSign(content: WorksheetContent) {
  let results
  try {
    results = recomputeResults(content)
  }
  catch (error) {
    if (error instanceof StepRefusal) throw asHttpError(error)
    throw error
  }
  const missing = missingForSignature(content, results)
  if (missing.length) {
    throw createError({
      status: 422,
      statusMessage: 'Unprocessable Entity',
      message: `Not ready to sign. Still needed: ${missing.join('; ')}.`,
      data: { missing },
    })
  }
  return results
}

/** What a performer's signature freezes: results recomputed now with this engine, and the verdict. */
function frozenForSignature(worksheet: Worksheet) {
  const results = resultsToSign(worksheet.content)
  return { results, engineVersion: ENGINE_VERSION, serviceable: results.asLeft!.assessment.verdict === 'in-limits' }
}

/** The record as a signature would be over it: as stored, with what the signature freezes in place. */
function recordToSign(worksheet: Worksheet, frozen?: ReturnType<typeof frozenForSignature>): SignedRecordSource {
  const attachments = (worksheet as Worksheet & { attachments?: Attachment[] }).attachments ?? []
  return {
    id: worksheet.id,
    round: worksheet.round,
    workOrder: worksheet.workOrder,
    reason: worksheet.reason,
    correctsId: worksheet.correctsId,
    performer: { id: worksheet.performerId },
    content: worksheet.content,
    results: frozen?.results ?? worksheet.results,
    engineVersion: frozen?.engineVersion ?? worksheet.engineVersion,
    serviceable: frozen?.serviceable ?? worksheet.serviceable,
    attachments: [...attachments].sort((a, b) => a.id - b.id),
  }
}

/**
 * What the signing form needs: the organisation's rule for this capacity and, when the signer has a
 * passkey, WebAuthn options whose challenge is the SHA-256 of what would be signed now.
 */
export async function signingOptions(
  event: H3Event,
  actor: Actor,
  id: number,
  capacity: SignatureCapacity,
): Promise<SigningOptionsDto> {
  await requireWorksheetInScope(actor, id)
  const signer = await currentSigner(actor.id)
  const worksheet = await findWorksheet(id)
  enforce(capacity === 'performer' ? canEdit(signer, worksheet) : canInspect(signer, worksheet))
  const record = recordToSign(worksheet, capacity === 'performer' ? frozenForSignature(worksheet) : undefined)
  // No tap on a passkey that would be refused: the authorisation is checked first, with its reason.
  const held = await authorisationToSign(signer, record.content, capacity)
  const proof = signingProof(record, { ...signer.get({ plain: true }), authorisationNumber: held.number }, capacity)
  const policy = await signingPolicy()
  return {
    rule: policy[capacity],
    passkey: policy[capacity] === 'password' ? null : await signingRequestOptions(event, signer.id, challengeOf(proof.payload)),
    contentHash: proof.payload.contentHash,
  }
}

/** The signature's proof: checked before any write (a password) or inside it (a passkey, whose counter moves). */
async function signedAs(
  signer: User,
  capacity: SignatureCapacity,
  proof: SignerProof,
  record: () => SignedRecordSource,
): Promise<(transaction: Transaction) => Promise<SignedAs>> {
  const method = signingMethod((await signingPolicy())[capacity], proof)
  // The password first (as before passkeys): a wrong one is refused whatever else is amiss.
  if (method === 'password') await confirmSigner(proof.event, signer, proof.password!)
  const source = record()
  // Under which certifying authorisation: named in what is signed, checked again inside the write.
  const held = await authorisationToSign(signer, source.content, capacity)
  const signingAs = { ...signer.get({ plain: true }), authorisationNumber: held.number }
  const { payload, signedFields } = signingProof(source, signingAs, capacity)
  return async (transaction) => {
    const authorisation = await authorisationToSign(signer, source.content, capacity, transaction)
    if (authorisation.number !== held.number) conflict('Your certifying authorisations changed while you signed; sign again.')
    const frozen = frozenAuthorisation(authorisation)
    if (method === 'password') return { method, payload, signedFields, passkeyId: null, assertion: null, authorisation: frozen }
    const answer = proof.passkey!
    const { passkey, assertion } = await verifySigningAssertion(proof.event, signer, answer, payload, transaction)
    return { method, payload, signedFields, passkeyId: passkey.id, assertion, authorisation: frozen }
  }
}

/**
 * The performer signs (password or passkey, as the organisation asks): results recomputed and frozen,
 * awaiting countersign; inspectors are told.
 */
export async function signWorksheet(
  actor: Actor,
  id: number,
  proof: SignerProof,
  expectedVersion?: number,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  const signer = await currentSigner(actor.id)
  const seen = await findWorksheet(id)
  enforce(canEdit(signer, seen))
  checkVersion(seen, expectedVersion)
  let frozen: ReturnType<typeof frozenForSignature> | undefined
  const prove = await signedAs(signer, 'performer', proof, () => recordToSign(seen, (frozen = frozenForSignature(seen))))
  const now = new Date()
  const { results, serviceable } = frozen!
  await writeTransaction(async (transaction) => {
    const signature = await prove(transaction)
    // Signed as seen: the version whose content was just checked, or the request loses.
    const changes = {
      state: 'awaiting-countersign' as const,
      results,
      engineVersion: ENGINE_VERSION,
      serviceable,
      submittedAt: now,
      returnReason: null,
    }
    await compareAndSet(seen, EDITABLE_STATES, changes, transaction)
    await createSignature(seen, signer, 'performer', now, transaction, signature)
    await audit(
      signer,
      seen,
      'signed',
      {
        engineVersion: ENGINE_VERSION,
        serviceable,
        round: seen.round,
        method: signature.method,
        contentHash: signature.payload.contentHash,
      },
      transaction,
      now,
    )
  })
  await askForCountersign(seen, signer)
  return worksheetById(id)
}

/** Independent inspection: an inspector who did not do the work countersigns, and the record is released. */
export async function countersignWorksheet(
  actor: Actor,
  id: number,
  proof: SignerProof,
  expectedVersion?: number,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  const signer = await currentSigner(actor.id)
  const seen = await findWorksheet(id)
  enforce(canInspect(signer, seen))
  checkVersion(seen, expectedVersion)
  const prove = await signedAs(signer, 'inspector', proof, () => recordToSign(seen))
  const now = new Date()
  await writeTransaction(async (transaction) => {
    const signature = await prove(transaction)
    await compareAndSet(seen, ['awaiting-countersign'], { state: 'released', releasedAt: now }, transaction)
    await createSignature(seen, signer, 'inspector', now, transaction, signature)
    await audit(
      signer,
      seen,
      'countersigned',
      {
        performerId: seen.performerId,
        round: seen.round,
        method: signature.method,
        contentHash: signature.payload.contentHash,
      },
      transaction,
      now,
    )
    // The released as-found joins its unit's trend, in the same write; a correction replaces what it corrects.
    const superseded = await trendAfterCorrection(seen, transaction)
    // Each alert's mail is queued in this same write: an alert is never raised without its mail.
    await mailAlerts([...superseded, ...(await trendAfterRelease(seen, transaction))])
    // So are the webhooks of the systems that follow records.
    await announceRecord('released', seen)
    if (seen.correctsId) await announceRecord('corrected', seen, { correctedId: seen.correctsId })
  })
  return worksheetById(id)
}

/** Back to the performer with a reason (they are told); the next signature opens a new round. */
export async function returnWorksheet(
  actor: Actor,
  id: number,
  reason: string,
  expectedVersion?: number,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  const worksheet = await writeTransaction(async (transaction) => {
    const found = await lockedWorksheet(id, transaction)
    enforce(canInspect(actor, found))
    checkVersion(found, expectedVersion)
    await compareAndSet(
      found,
      ['awaiting-countersign'],
      { state: 'returned', returnReason: reason, submittedAt: null, round: found.round + 1 },
      transaction,
    )
    await audit(actor, found, 'returned', { reason, round: found.round }, transaction)
    await announceRecord('returned', found, { reason })
    return found
  })
  await tellReturned(worksheet, actor, reason)
  return worksheetById(id)
}

/** Voided with a reason: the record stays, readable, marked voided. */
export async function voidWorksheet(
  actor: Actor,
  id: number,
  reason: string,
  expectedVersion?: number,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canVoid(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    const previousState = worksheet.state
    await compareAndSet(
      worksheet,
      ['draft', 'awaiting-countersign', 'released', 'returned'],
      { state: 'voided', voidReason: reason, voidedById: actor.id },
      transaction,
    )
    await audit(actor, worksheet, 'voided', { reason, previousState }, transaction)
    await announceRecord('voided', worksheet, { reason })
    await mailAlerts(await trendAfterVoid(worksheet, previousState, transaction))
  })
  return worksheetById(id)
}

/** The performer discards a draft that was never signed: kept, marked voided, with the reason. */
export async function discardWorksheet(
  actor: Actor,
  id: number,
  reason: string,
  expectedVersion?: number,
): Promise<WorksheetDto> {
  await requireWorksheetInScope(actor, id)
  await writeTransaction(async (transaction) => {
    const worksheet = await lockedWorksheet(id, transaction)
    enforce(canDiscard(actor, worksheet))
    checkVersion(worksheet, expectedVersion)
    const voidReason = `Discarded by the performer before signing${reason ? `: ${reason}` : '.'}`
    await compareAndSet(worksheet, ['draft'], { state: 'voided', voidReason, voidedById: actor.id }, transaction)
    await audit(actor, worksheet, 'discarded', { reason }, transaction)
  })
  return worksheetById(id)
}
