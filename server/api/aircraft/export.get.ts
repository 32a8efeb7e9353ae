import { noQuerySchema } from '#shared/schemas/common'
import { exportRegister } from '../../services/exports'

/** The fleet as CSV, in the import format. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return exportRegister(event, 'aircraft', scope)
})
