import { Accumulator, Aircraft } from '../../models'

/** Accumulators as CSV, in the import format. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const rows = await Accumulator.findAll({ include: [{ model: Aircraft, as: 'aircraft' }], order: [['partNumber', 'ASC'], ['serialNumber', 'ASC']] })
  return sendCsv(event, 'accumulators', rows.map(row => ({
    partNumber: row.partNumber, serialNumber: row.serialNumber, system: row.system, registration: row.aircraft?.registration, position: row.position, installedAt: row.installedAt,
  })), ['partNumber', 'serialNumber', 'system', 'registration', 'position', 'installedAt'])
})
