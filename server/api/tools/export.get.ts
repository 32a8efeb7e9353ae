import { noQuerySchema } from '#shared/schemas/common'
import { exportRegister } from '../../services/exports'

/** The tool register as CSV, in the import format. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return exportRegister(event, 'tools', scope)
})
