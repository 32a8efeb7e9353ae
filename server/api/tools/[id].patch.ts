import { idParamsSchema } from '../../../shared/schemas/auth'
import { toolUpdateSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Tool } from '../../models'

/** Records a new calibration, corrects a tool's figures, or withdraws it (active: false). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(toolUpdateSchema))
  const tool = await Tool.findByPk(id)
  if (!tool) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Tool not found.' })
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    await tool.update(body, { transaction })
    await appendAudit({ actorId: user.id, entity: 'tool', entityId: String(id), action: 'updated', detail: body }, transaction)
  })
  return toToolDto(tool)
})
