import { idParamsSchema } from '#shared/schemas/common'
import { duplicateStudy } from '../../../services/studies'

/** A copy of a study to vary, named "(copy)". */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'study.edit')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  setResponseStatus(event, 201)
  return duplicateStudy(user, id)
})
