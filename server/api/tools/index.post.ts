import { toolSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Tool } from '../../models'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readValidatedBody(event, validateWith(toolSchema))
  const tool = await uniqueOr409(() => writeTransaction(async (transaction) => {
    const created = await Tool.create(body, { transaction })
    await appendAudit({ actorId: user.id, entity: 'tool', entityId: String(created.id), action: 'created', detail: body }, transaction)
    return created
  }), 'A tool with that asset number is already registered.')
  setResponseStatus(event, 201)
  return toToolDto(tool)
})
