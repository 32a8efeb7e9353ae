import { studyInputSchema } from '#shared/schemas/study'
import { createStudy } from '../../services/studies'

/** Saves a new study; the server computes its results and freezes them with the engine version. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'study.edit')
  const inputs = await readValidatedBody(event, validateWith(studyInputSchema))
  setResponseStatus(event, 201)
  return createStudy(user, inputs)
})
