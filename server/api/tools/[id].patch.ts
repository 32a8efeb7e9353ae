import { idParamsSchema } from '#shared/schemas/common'
import { toolUpdateSchema } from '#shared/schemas/tools'
import { updateTool } from '../../services/tools'

/** Records a new calibration, corrects a tool's figures, or withdraws it (active: false). */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'tool.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(toolUpdateSchema))
  return updateTool(user, id, body)
})
