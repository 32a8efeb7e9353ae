import type { Transaction } from 'sequelize'
import type { z } from 'zod'
import type { cycleCheckQuerySchema, CycleCheckBody } from '#shared/schemas/cycle-check'
import { intervalToSeconds } from '#shared/gas/units'
import { cycleCheckLeakRate } from '#shared/utils/cycle-check'
import { canChangeCycleCheck } from '#shared/utils/cycle-check-rules'
import { enforce } from './worksheets'
import type { CycleCheckDto } from '#shared/types/trends'
import { appendAudit } from '../database/audit-chain'
import { Accumulator, Aircraft, CycleCheck, type User } from '../models'
import { mailAlerts } from './notifications'
import { currentSpecification } from './specifications'
import { scopeOf, seesAircraft, withinScope, type Scope } from './scope'
import { trendAfterCycleCheck } from './trends'

/**
 * Pump cycle checks: recorded, corrected and withdrawn. The server works out the implied leak
 * rate from the system accumulator's specification; each change is one write with its audit
 * entry, and moves the system's interval trend (raising or clearing its alert) in the same write.
 */

function unprocessable(message: string, field: string): never {
  throw createError({
    status: 422,
    statusMessage: 'Unprocessable Entity',
    message,
    data: { field, issues: [{ path: field.split('.'), field, message }] },
  })
}

/** The figures a check stores: its accumulator, the engine's leak rate, the interval in seconds. */
async function evaluate(body: CycleCheckBody, actor: User) {
  // An aircraft the actor may not see is answered as one without the unit: its existence is not given away.
  if (!seesAircraft(await scopeOf(actor), body.aircraftId))
    unprocessable(`No accumulator is installed on that aircraft for ${body.system}.`, 'system')
  const accumulator = await Accumulator.findOne({ where: { aircraftId: body.aircraftId, system: body.system } })
  if (!accumulator) unprocessable(`No accumulator is installed on that aircraft for ${body.system}.`, 'system')
  const specification = await currentSpecification(accumulator.partNumber)
  if (!specification)
    unprocessable(`No current specification for P/N ${accumulator.partNumber}: ask engineering.`, 'system')
  const result = runEngine(() => cycleCheckLeakRate(body, specification))
  return {
    aircraftId: body.aircraftId,
    accumulatorId: accumulator.id,
    system: body.system,
    checkedAt: body.checkedAt ? new Date(`${body.checkedAt}T12:00:00Z`) : new Date(),
    inputs: body,
    results: {
      fluidReleased: result.fluidReleased,
      leakRate: result.leakRate,
      warnings: result.warnings,
      method: result.method,
    },
    intervalSeconds: intervalToSeconds(body.interval),
    engineVersion: result.engineVersion,
  }
}

export function toCycleCheckDto(check: CycleCheck & { aircraft?: Aircraft }): CycleCheckDto {
  const plain = check.get({ plain: true }) as CycleCheck
  return {
    id: plain.id,
    version: plain.version,
    aircraftId: plain.aircraftId,
    registration: check.aircraft?.registration ?? null,
    system: plain.system,
    accumulatorId: plain.accumulatorId,
    checkedAt: plain.checkedAt.toISOString(),
    intervalSeconds: plain.intervalSeconds,
    inputs: plain.inputs,
    results: plain.results as CycleCheckDto['results'],
    engineVersion: plain.engineVersion,
    recordedById: plain.recordedById,
    withdrawnAt: plain.withdrawnAt?.toISOString() ?? null,
    withdrawnReason: plain.withdrawnReason ?? null,
  }
}

export async function listCycleChecks(query: z.infer<typeof cycleCheckQuerySchema>, scope: Scope) {
  const { total, totalCapped, rows } = await pageOf(CycleCheck, {
    where: withinScope(scope, {
      ...(query.aircraftId ? { aircraftId: query.aircraftId } : {}),
      ...(query.system ? { system: query.system } : {}),
    }),
    include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }],
    order: [
      ['checkedAt', 'DESC'],
      ['id', 'DESC'],
    ],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, totalCapped, items: rows.map(toCycleCheckDto) }
}

async function lockedCheck(id: number, transaction: Transaction, actor: User): Promise<CycleCheck> {
  const check = await CycleCheck.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!check || !seesAircraft(await scopeOf(actor), check.aircraftId)) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Cycle check not found.' })
  return check
}

/** Writes a change made on the version read, or 409 when someone else changed the check first. */
async function compareAndSet(
  check: CycleCheck,
  changes: Partial<CycleCheck>,
  expectedVersion: number | undefined,
  transaction: Transaction,
) {
  if (expectedVersion !== undefined && expectedVersion !== check.version) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'This check was changed since you opened it. Reload it and check it again.',
    })
  }
  const [updated] = await CycleCheck.update(
    { ...changes, version: check.version + 1 },
    { where: { id: check.id, version: check.version, withdrawnAt: null }, transaction },
  )
  if (updated !== 1)
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: 'Someone else changed or withdrew this check a moment ago; yours was not saved.',
    })
}

export async function recordCycleCheck(actor: User, body: CycleCheckBody): Promise<CycleCheckDto> {
  const figures = await evaluate(body, actor)
  const check = await writeTransaction(async (transaction) => {
    const created = await CycleCheck.create({ ...figures, recordedById: actor.id }, { transaction })
    await appendAudit(
      {
        actorId: actor.id,
        entity: 'cycle-check',
        entityId: String(created.id),
        action: 'recorded',
        detail: { aircraftId: body.aircraftId, system: body.system },
      },
      transaction,
    )
    // Each alert's mail is queued in this same write: an alert is never raised without its mail.
    await mailAlerts(await trendAfterCycleCheck(body.aircraftId, body.system, transaction))
    return created
  })
  return toCycleCheckDto(check)
}

/** A correction: new figures for the same check (the old ones stay in the audit trail's hash). */
export async function correctCycleCheck(
  actor: User,
  id: number,
  body: CycleCheckBody,
  expectedVersion?: number,
): Promise<CycleCheckDto> {
  const figures = await evaluate(body, actor)
  await writeTransaction(async (transaction) => {
    const check = await lockedCheck(id, transaction, actor)
    enforce(canChangeCycleCheck(actor, check))
    const before = { aircraftId: check.aircraftId, system: check.system }
    await compareAndSet(check, figures, expectedVersion, transaction)
    await appendAudit(
      {
        actorId: actor.id,
        entity: 'cycle-check',
        entityId: String(id),
        action: 'corrected',
        detail: { intervalSeconds: figures.intervalSeconds },
      },
      transaction,
    )
    const moved
      = before.aircraftId !== body.aircraftId || before.system !== body.system
        ? await trendAfterCycleCheck(before.aircraftId, before.system, transaction)
        : []
    await mailAlerts([...moved, ...(await trendAfterCycleCheck(body.aircraftId, body.system, transaction))])
  })
  return toCycleCheckDto(
    (await CycleCheck.findByPk(id, { include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }] }))!,
  )
}

/** Withdrawn with a reason: kept as it was, out of the trend. */
export async function withdrawCycleCheck(
  actor: User,
  id: number,
  reason: string,
  expectedVersion?: number,
): Promise<CycleCheckDto> {
  await writeTransaction(async (transaction) => {
    const check = await lockedCheck(id, transaction, actor)
    enforce(canChangeCycleCheck(actor, check))
    await compareAndSet(
      check,
      { withdrawnAt: new Date(), withdrawnReason: reason, withdrawnById: actor.id },
      expectedVersion,
      transaction,
    )
    await appendAudit(
      { actorId: actor.id, entity: 'cycle-check', entityId: String(id), action: 'withdrawn', detail: { reason } },
      transaction,
    )
    await mailAlerts(await trendAfterCycleCheck(check.aircraftId, check.system, transaction))
  })
  return toCycleCheckDto(
    (await CycleCheck.findByPk(id, { include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }] }))!,
  )
}
