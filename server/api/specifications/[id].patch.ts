import { idParamsSchema } from '#shared/schemas/common'
import { specificationUpdateSchema } from '#shared/schemas/specifications'
import { changeSpecification } from '../../services/specifications'

/**
 * Title, check interval and loss threshold change in place (200). Any change to the approved-data
 * figures is a new revision (201) that supersedes this one; worksheets keep the revision they used.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'specification.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const changes = await readValidatedBody(event, validateWith(specificationUpdateSchema))
  const { revised, specification } = await changeSpecification(user, id, changes)
  if (revised) setResponseStatus(event, 201)
  return specification
})
