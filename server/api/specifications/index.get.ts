import { z } from 'zod'
import { Specification, SpecificationTablePoint } from '../../models'
import { toSpecificationDto } from '../../utils/registers'

const querySchema = z.object({ status: z.enum(['current', 'superseded', 'all']).default('current') })

/** Specifications, current revisions by default; every signed-in role may read them. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { status } = await getValidatedQuery(event, validateWith(querySchema))
  const specifications = await Specification.findAll({
    where: status === 'all' ? {} : { status },
    include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
    order: [['partNumber', 'ASC'], ['revision', 'DESC']],
  })
  return specifications.map(toSpecificationDto)
})
