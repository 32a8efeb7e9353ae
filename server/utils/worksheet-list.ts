import { Op, type WhereOptions } from 'sequelize'
import type { Accumulator, Aircraft, User, Worksheet } from '../models'
import type { WorksheetResults } from '../../shared/types/worksheet'

/** One row of the worksheets table (and of its CSV export). */
export function worksheetListItem(row: Worksheet) {
  const joined = row as Worksheet & { performer?: User, aircraft?: Aircraft, accumulator?: Accumulator }
  const results = row.results as WorksheetResults
  return {
    id: row.id,
    state: row.state,
    workOrder: row.workOrder,
    reason: row.reason,
    performer: joined.performer?.name ?? '',
    performerId: row.performerId,
    registration: joined.aircraft?.registration ?? '',
    fleetNumber: joined.aircraft?.fleetNumber ?? '',
    position: joined.accumulator?.position ?? '',
    partNumber: joined.accumulator?.partNumber ?? '',
    serialNumber: joined.accumulator?.serialNumber ?? '',
    asFoundVerdict: results.asFound?.assessment.verdict ?? null,
    asLeftVerdict: results.asLeft?.assessment.verdict ?? null,
    correctsId: row.correctsId,
    performedAt: row.performedAt?.toISOString() ?? null,
    releasedAt: row.releasedAt?.toISOString() ?? null,
    createdAt: row.createdAt.toISOString(),
  }
}

/** The list filters as a where clause (shared by the table and its CSV export). */
export function worksheetFilter(query: { aircraftId?: number, accumulatorId?: number, state?: string, performerId?: number, from?: string, to?: string }): WhereOptions {
  const where: Record<string | symbol, unknown> = {}
  if (query.aircraftId) where.aircraftId = query.aircraftId
  if (query.accumulatorId) where.accumulatorId = query.accumulatorId
  if (query.state) where.state = query.state
  if (query.performerId) where.performerId = query.performerId
  if (query.from || query.to) {
    where.createdAt = {
      ...(query.from ? { [Op.gte]: new Date(`${query.from}T00:00:00Z`) } : {}),
      ...(query.to ? { [Op.lt]: new Date(Date.parse(`${query.to}T00:00:00Z`) + 86_400_000) } : {}),
    }
  }
  return where
}
