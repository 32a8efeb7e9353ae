import { idParamsSchema } from '#shared/schemas/common'
import { specificationById } from '../../services/specifications'

/** One specification revision with its approved-data table. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'register.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return specificationById(id)
})
