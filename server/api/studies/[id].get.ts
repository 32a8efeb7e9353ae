import { idParamsSchema } from '#shared/schemas/common'
import { studyById } from '../../services/studies'

/** One study with its inputs and frozen results. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'study.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return studyById(id)
})
