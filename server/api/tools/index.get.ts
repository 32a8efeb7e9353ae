import { Op } from 'sequelize'
import { toolQuerySchema } from '../../../shared/schemas/registers'
import { Tool } from '../../models'

/** Gauges and nitrogen carts with their calibration state: search, filter, sort, pages. Every signed-in role. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(toolQuerySchema))
  const today = stationToday()
  const { total, rows } = await pageOf(Tool, {
    where: {
      ...searchWhere(query.q, ['assetNumber', 'description']),
      ...(query.kind ? { kind: query.kind } : {}),
      ...(query.active !== undefined ? { active: query.active } : {}),
      ...(query.calibration === 'expired' ? { calibrationDue: { [Op.lt]: today } } : query.calibration === 'valid' ? { calibrationDue: { [Op.gte]: today } } : {}),
    },
    order: [[query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: rows.map(toToolDto) }
})
