import { accumulatorSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Accumulator, AccumulatorInstallation, Aircraft } from '../../models'

/** Registers an accumulator, installed on an aircraft or in stores. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readValidatedBody(event, validateWith(accumulatorSchema))
  if (body.aircraftId && !(await Aircraft.findByPk(body.aircraftId))) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'No such aircraft.', data: { field: 'aircraftId' } })
  const accumulator = await uniqueOr409(() => writeTransaction(async (transaction) => {
    const created = await Accumulator.create(body, { transaction })
    if (body.aircraftId) await AccumulatorInstallation.create({ accumulatorId: created.id, aircraftId: body.aircraftId, position: body.position!, installedAt: body.installedAt!, removedAt: null, removalReason: null }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'accumulator', entityId: String(created.id), action: 'created', detail: body }, transaction)
    return created
  }), 'That part and serial number is already registered.')
  setResponseStatus(event, 201)
  return (await toInstalledUnits([await Accumulator.findByPk(accumulator.id, { include: [{ model: Aircraft, as: 'aircraft' }] }) as Accumulator]))[0]
})
