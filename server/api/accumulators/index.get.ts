import { Op } from 'sequelize'
import { Accumulator, Aircraft, Specification } from '../../models'

/** Installed accumulators with their aircraft and current specification id. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const accumulators = await Accumulator.findAll({
    where: { aircraftId: { [Op.ne]: null } },
    include: [{ model: Aircraft, as: 'aircraft' }],
    order: [[{ model: Aircraft, as: 'aircraft' }, 'registration', 'ASC'], ['position', 'ASC']],
  })
  const current = await Specification.findAll({ where: { status: 'current' }, attributes: ['id', 'partNumber'] })
  const specificationFor = new Map(current.map(specification => [specification.partNumber, specification.id]))
  return accumulators.map(accumulator => ({
    id: accumulator.id,
    partNumber: accumulator.partNumber,
    serialNumber: accumulator.serialNumber,
    position: accumulator.position,
    system: accumulator.system,
    installedAt: accumulator.installedAt,
    aircraft: accumulator.aircraft ? { id: accumulator.aircraft.id, registration: accumulator.aircraft.registration, fleetNumber: accumulator.aircraft.fleetNumber, type: accumulator.aircraft.type, base: accumulator.aircraft.base } : null,
    specificationId: specificationFor.get(accumulator.partNumber) ?? null,
  }))
})
