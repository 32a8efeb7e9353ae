import { idParamsSchema } from '#shared/schemas/common'
import { signatureBodySchema } from '#shared/schemas/signing'
import { countersignWorksheet, versioned } from '../../../services/worksheets'

/**
 * Independent inspection: an inspector who did not do the work countersigns (password or passkey); the record
 * is released.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.inspect')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password, passkey } = await readValidatedBody(event, validateWith(signatureBodySchema))
  const proof = { event, password, passkey: passkey as never }
  return versioned(event, await countersignWorksheet(user, id, proof, expectedVersion(event)))
})
