import { aircraftQuerySchema } from '../../../shared/schemas/registers'
import { Aircraft } from '../../models'

/** The fleet: search, filter by type, base and active, sort, pages. Every signed-in role. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(aircraftQuerySchema))
  const { total, rows } = await pageOf(Aircraft, {
    where: {
      ...searchWhere(query.q, ['registration', 'fleetNumber', 'type', 'base']),
      ...(query.type ? { type: query.type } : {}),
      ...(query.base ? { base: query.base } : {}),
      ...(query.active !== undefined ? { active: query.active } : {}),
    },
    order: [[query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: rows.map(row => row.get({ plain: true })) }
})
