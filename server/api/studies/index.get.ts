import { studyListQuerySchema } from '#shared/schemas/study'
import { listStudies } from '../../services/studies'

/** Saved sizing studies, newest first, with search. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'study.read')
  const query = await getValidatedQuery(event, validateWith(studyListQuerySchema))
  return listStudies(query)
})
