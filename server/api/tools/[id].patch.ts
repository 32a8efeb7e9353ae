import { idParamsSchema } from '../../../shared/schemas/auth'
import { toolSchema, toolUpdateSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Tool } from '../../models'

/** Records a new calibration, corrects a tool's figures, or withdraws it (active: false). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(toolUpdateSchema))
  const tool = await Tool.findByPk(id)
  if (!tool) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Tool not found.' })
  // The tool as it would be must still be a whole tool: a gauge keeps a range and an accuracy.
  const { id: _id, createdAt: _created, updatedAt: _updated, ...current } = tool.get({ plain: true })
  parseInput(toolSchema, { ...current, ...body })
  await writeTransaction(async (transaction) => {
    await tool.update(body, { transaction })
    await appendAudit({ actorId: user.id, entity: 'tool', entityId: String(id), action: 'updated', detail: body }, transaction)
  })
  return toToolDto(tool)
})
