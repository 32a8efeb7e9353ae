import { specificationQuerySchema } from '#shared/schemas/specifications'
import { listSpecifications } from '../../services/specifications'

/** Specifications (current revisions by default): search, filter, sort, pages. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'register.read')
  const query = await getValidatedQuery(event, validateWith(specificationQuerySchema))
  return listSpecifications(query)
})
