import { idParamsSchema } from '#shared/schemas/common'
import { toolById } from '../../services/tools'

/** One gauge or cart with its calibration state. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'register.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return toolById(id)
})
