import { accumulatorCsvRow, accumulatorSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Accumulator, AccumulatorInstallation, Aircraft } from '../../models'

/** Imports accumulators (installed where a registration is given): every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const fleet = new Map((await Aircraft.findAll()).map(aircraft => [aircraft.registration, aircraft.id]))
  const rowSchema = accumulatorCsvRow.transform((row, context) => {
    const aircraftId = row.registration ? fleet.get(row.registration.toUpperCase()) : null
    if (row.registration && !aircraftId) context.addIssue({ code: 'custom', path: ['registration'], message: `No aircraft ${row.registration} in the fleet.` })
    return { partNumber: row.partNumber, serialNumber: row.serialNumber, system: row.system, aircraftId: aircraftId ?? null, position: row.position, installedAt: row.installedAt }
  }).pipe(accumulatorSchema)
  return importCsv(event, rowSchema, async (row, transaction) => {
    const created = await Accumulator.create(row, { transaction })
    if (row.aircraftId) await AccumulatorInstallation.create({ accumulatorId: created.id, aircraftId: row.aircraftId, position: row.position!, installedAt: row.installedAt!, removedAt: null, removalReason: null }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'accumulator', entityId: String(created.id), action: 'imported', detail: row }, transaction)
  })
})
