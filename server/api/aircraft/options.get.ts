import { noQuerySchema } from '#shared/schemas/common'
import { fleetOptions } from '../../services/aircraft'

/** The aircraft types and bases in the register, for filters: options come from the data, never from a page. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return fleetOptions(scope)
})
