import { fieldReferenceQuerySchema } from '#shared/schemas/field'
import { referenceUpdate } from '#shared/utils/field-reference-delta'
import { fieldReference } from '../../services/device-sync'

/**
 * What a technician's device keeps to work with no signal: the station's units, their specifications,
 * the tools. Given the digests of the copy the device holds, only what changed (see field-reference-delta).
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const query = await getValidatedQuery(event, validateWith(fieldReferenceQuerySchema))
  const reference = await fieldReference(user)
  if (!query.units) return reference
  return referenceUpdate(reference, { units: query.units, specifications: query.specifications!, tools: query.tools! })
})
