import { idParamsSchema } from '../../../shared/schemas/auth'
import { accumulatorUpdateSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Accumulator, AccumulatorInstallation, Aircraft } from '../../models'

/** Corrects an accumulator's identity, or moves it (off its aircraft, or onto another) keeping its history. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { move, ...fields } = await readValidatedBody(event, validateWith(accumulatorUpdateSchema))
  const accumulator = await Accumulator.findByPk(id)
  if (!accumulator) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Accumulator not found.' })
  if (move?.aircraftId && !(await Aircraft.findByPk(move.aircraftId))) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'No such aircraft.', data: { field: 'move.aircraftId' } })
  if (move && accumulator.installedAt && move.date < accumulator.installedAt) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `The move date is before the unit was installed (${accumulator.installedAt}).`, data: { field: 'move.date' } })
  await uniqueOr409(() => writeTransaction(async (transaction) => {
    if (Object.keys(fields).length) await accumulator.update(fields, { transaction })
    if (move) {
      await AccumulatorInstallation.update({ removedAt: move.date, removalReason: move.reason ?? null }, { where: { accumulatorId: id, removedAt: null }, transaction })
      if (move.aircraftId) await AccumulatorInstallation.create({ accumulatorId: id, aircraftId: move.aircraftId, position: move.position!, installedAt: move.date, removedAt: null, removalReason: null }, { transaction })
      await accumulator.update({ aircraftId: move.aircraftId, position: move.aircraftId ? move.position! : null, installedAt: move.aircraftId ? move.date : null }, { transaction })
    }
    await appendAudit({ actorId: user.id, entity: 'accumulator', entityId: String(id), action: move ? (move.aircraftId ? 'moved' : 'removed') : 'updated', detail: { fields, move: move ?? null } }, transaction)
  }), 'That part and serial number is already registered.')
  return (await toInstalledUnits([await Accumulator.findByPk(id, { include: [{ model: Aircraft, as: 'aircraft' }] }) as Accumulator]))[0]
})
