import { idParamsSchema } from '#shared/schemas/common'
import { unitDetail } from '../../services/accumulators'

/** One accumulator with where it has been (installations) and its worksheets. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return unitDetail(id, scope)
})
