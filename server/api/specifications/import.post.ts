import { importSpecifications } from '../../services/specifications'

/** Imports specifications: a new part number is added, a new revision supersedes. Every row valid, or nothing. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'specification.manage')
  return importSpecifications(event, user)
})
