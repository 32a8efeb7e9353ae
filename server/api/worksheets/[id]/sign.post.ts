import { idParamsSchema } from '#shared/schemas/common'
import { signatureBodySchema } from '#shared/schemas/signing'
import { signWorksheet, versioned } from '../../../services/worksheets'

/** The performer signs (password or passkey): results are recomputed and frozen, and inspectors are told. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password, passkey } = await readValidatedBody(event, validateWith(signatureBodySchema))
  const proof = { event, password, passkey: passkey as never }
  return versioned(event, await signWorksheet(user, id, proof, expectedVersion(event)))
})
