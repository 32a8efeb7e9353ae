import { idParamsSchema } from '../../../shared/schemas/auth'
import { Specification, SpecificationTablePoint } from '../../models'
import { toSpecificationDto } from '../../utils/registers'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const specification = await Specification.findByPk(id, { include: [{ model: SpecificationTablePoint, as: 'tablePoints' }] })
  if (!specification) throw createError({ status: 404, message: 'Specification not found.' })
  return toSpecificationDto(specification)
})
