import { aircraftCsvRow } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Aircraft } from '../../models'

/** Imports aircraft from CSV (columns as the export): every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const report = await importCsv(event, aircraftCsvRow, async (row, transaction) => {
    const created = await Aircraft.create(row, { transaction })
    await appendAudit({ actorId: user.id, entity: 'aircraft', entityId: String(created.id), action: 'imported', detail: row }, transaction)
  })
  return report
})
