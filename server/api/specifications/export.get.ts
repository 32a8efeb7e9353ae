import { noQuerySchema } from '#shared/schemas/common'
import { exportRegister } from '../../services/exports'

/** Specifications as CSV in the import format; table points as "-40 C 1170; 0 C 1390". */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return exportRegister(event, 'specifications', scope)
})
