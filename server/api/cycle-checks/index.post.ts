import { cycleCheckSchema } from '../../../shared/schemas/cycle-check'
import { intervalToSeconds } from '../../../shared/gas/units'
import { cycleCheckLeakRate } from '../../../shared/utils/cycle-check'
import { appendAudit } from '../../database/audit-chain'
import { Accumulator, CycleCheck, Specification } from '../../models'
import { mailAlerts, trendAfterCycleCheck } from '../../services/trends'

/** Logs a pump cycle check; the server works out the implied leak rate from the system accumulator. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician', 'engineer')
  const body = await readValidatedBody(event, validateWith(cycleCheckSchema))
  const accumulator = await Accumulator.findOne({ where: { aircraftId: body.aircraftId, system: body.system } })
  if (!accumulator) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `No accumulator is installed on that aircraft for ${body.system}.`, data: { field: 'system' } })
  const specification = await Specification.findOne({ where: { partNumber: accumulator.partNumber, status: 'current' } })
  if (!specification) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `No current specification for P/N ${accumulator.partNumber}.`, data: { field: 'system' } })
  const result = runEngine(() => cycleCheckLeakRate(body, specification))
  const { check, alerts } = await writeTransaction(async (transaction) => {
    const created = await CycleCheck.create({
      aircraftId: body.aircraftId, accumulatorId: accumulator.id, system: body.system, checkedAt: body.checkedAt ? new Date(`${body.checkedAt}T12:00:00Z`) : new Date(),
      inputs: body, results: { fluidReleased: result.fluidReleased, leakRate: result.leakRate, warnings: result.warnings, method: result.method },
      intervalSeconds: intervalToSeconds(body.interval), engineVersion: result.engineVersion, recordedById: user.id,
    }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'cycle-check', entityId: String(created.id), action: 'recorded', detail: { aircraftId: body.aircraftId, system: body.system } }, transaction)
    return { check: created, alerts: await trendAfterCycleCheck(body.aircraftId, body.system, transaction) }
  })
  await mailAlerts(alerts)
  setResponseStatus(event, 201)
  return check.get({ plain: true })
})
