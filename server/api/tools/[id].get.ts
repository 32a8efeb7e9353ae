import { idParamsSchema } from '../../../shared/schemas/auth'
import { Tool } from '../../models'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const tool = await Tool.findByPk(id)
  if (!tool) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Tool not found.' })
  return toToolDto(tool)
})
