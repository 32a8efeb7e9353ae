import { idParamsSchema } from '#shared/schemas/common'
import { studyInputSchema } from '#shared/schemas/study'
import { updateStudy } from '../../services/studies'

/** Replaces a study's inputs and recomputes its results. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'study.edit')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const inputs = await readValidatedBody(event, validateWith(studyInputSchema))
  return updateStudy(user, id, inputs)
})
