import { idParamsSchema } from '../../../shared/schemas/auth'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return worksheetAnswer(event, id)
})
