import { Op } from 'sequelize'
import { accumulatorQuerySchema } from '../../../shared/schemas/registers'
import { Accumulator, Aircraft } from '../../models'

/** Accumulators with their aircraft and current specification: search, filter, sort, pages. Every signed-in role. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(accumulatorQuerySchema))
  const { total, rows } = await pageOf(Accumulator, {
    where: {
      ...searchWhere(query.q, ['partNumber', 'serialNumber', 'position', 'system', '$aircraft.registration$']),
      ...(query.installed === true ? { aircraftId: { [Op.ne]: null } } : query.installed === false ? { aircraftId: null } : {}),
      ...(query.aircraftId ? { aircraftId: query.aircraftId } : {}),
      ...(query.partNumber ? { partNumber: query.partNumber } : {}),
      ...(query.type ? { '$aircraft.type$': query.type } : {}),
      ...(query.base ? { '$aircraft.base$': query.base } : {}),
    },
    include: [{ model: Aircraft, as: 'aircraft' }],
    order: [[{ model: Aircraft, as: 'aircraft' }, 'registration', query.direction.toUpperCase()], [query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: await toInstalledUnits(rows) }
})
