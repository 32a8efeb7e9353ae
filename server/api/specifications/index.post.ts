import { specificationSchema } from '#shared/schemas/specifications'
import { createSpecification } from '../../services/specifications'

/** A specification for a part number not yet in the register. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'specification.manage')
  const body = await readValidatedBody(event, validateWith(specificationSchema))
  setResponseStatus(event, 201)
  return createSpecification(user, body)
})
