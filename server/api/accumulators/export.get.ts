import { noQuerySchema } from '#shared/schemas/common'
import { exportRegister } from '../../services/exports'

/** Accumulators as CSV, in the import format. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return exportRegister(event, 'accumulators', scope)
})
