import { specificationQuerySchema } from '../../../shared/schemas/registers'
import { Specification, SpecificationTablePoint } from '../../models'

/** Specifications (current revisions by default): search, filter, sort, pages. Every signed-in role. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(specificationQuerySchema))
  const { total, rows } = await pageOf(Specification, {
    where: {
      ...searchWhere(query.q, ['partNumber', 'title', 'dataReference']),
      ...(query.status === 'all' ? {} : { status: query.status }),
      ...(query.accumulatorType ? { accumulatorType: query.accumulatorType } : {}),
    },
    include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
    order: [[query.sort, query.direction.toUpperCase()], ['revision', 'DESC']],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: rows.map(toSpecificationDto) }
})
