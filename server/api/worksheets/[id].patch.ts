import { idParamsSchema } from '#shared/schemas/common'
import { worksheetStepSchema } from '#shared/schemas/worksheet'
import { saveStep, versioned } from '../../services/worksheets'

/**
 * Saves one completed step. The server recomputes every figure; a signed worksheet answers 409. A
 * step a device kept while offline says when it was taken (`X-Taken-At`, ISO 8601).
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const step = await readValidatedBody(event, validateWith(worksheetStepSchema))
  return versioned(event, await saveStep(user, id, step, expectedVersion(event), getRequestHeader(event, 'x-taken-at')))
})
