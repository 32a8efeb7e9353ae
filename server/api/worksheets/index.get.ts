import { worksheetListQuerySchema } from '../../../shared/schemas/worksheet'
import { Aircraft, Accumulator, User, Worksheet } from '../../models'

/** Worksheets with server-side filter, sort and pagination; every signed-in role may read them. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(worksheetListQuerySchema))
  const { rows, count } = await Worksheet.findAndCountAll({
    where: worksheetFilter(query),
    include: [
      { model: User, as: 'performer', attributes: ['id', 'name'] },
      { model: Aircraft, as: 'aircraft', attributes: ['id', 'registration', 'fleetNumber'] },
      { model: Accumulator, as: 'accumulator', attributes: ['id', 'partNumber', 'serialNumber', 'position'] },
    ],
    order: [[query.sort, query.direction.toUpperCase()], ['id', query.direction.toUpperCase()]],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  })
  return {
    total: count,
    page: query.page,
    pageSize: query.pageSize,
    items: rows.map(worksheetListItem),
  }
})
