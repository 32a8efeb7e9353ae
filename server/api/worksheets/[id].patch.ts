import { idParamsSchema } from '../../../shared/schemas/auth'
import { worksheetStepSchema } from '../../../shared/schemas/worksheet'
import { saveStep } from '../../services/worksheets'

/** Saves one completed step. The server recomputes every figure; a signed worksheet answers 409. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const step = await readValidatedBody(event, validateWith(worksheetStepSchema))
  await saveStep(user, id, step, expectedVersion(event))
  return worksheetAnswer(event, id)
})
