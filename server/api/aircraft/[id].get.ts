import { idParamsSchema } from '#shared/schemas/common'
import { aircraftById } from '../../services/aircraft'

/** An aircraft with the accumulators installed on it. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return aircraftById(id, scope)
})
