import { toolCsvRow } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Tool } from '../../models'

/** Imports gauges and carts from CSV: every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  return importCsv(event, toolCsvRow, async (row, transaction) => {
    const created = await Tool.create(row, { transaction })
    await appendAudit({ actorId: user.id, entity: 'tool', entityId: String(created.id), action: 'imported', detail: row }, transaction)
  })
})
