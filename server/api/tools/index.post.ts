import { toolSchema } from '#shared/schemas/tools'
import { createTool } from '../../services/tools'

/** Adds a gauge or nitrogen cart to the register. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'tool.manage')
  const body = await readValidatedBody(event, validateWith(toolSchema))
  setResponseStatus(event, 201)
  return createTool(user, body)
})
