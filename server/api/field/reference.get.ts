import { noQuerySchema } from '#shared/schemas/common'
import { fieldReference } from '../../services/field'

/** What a technician's device keeps to work with no signal: the station's units, their specifications, the tools. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return fieldReference(user)
})
