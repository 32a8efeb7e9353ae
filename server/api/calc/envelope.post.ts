import { envelopeSchema } from '#shared/schemas/calc'
import { usableVolumeEnvelope } from '#shared/gas/usable-volume'

/** POST /api/calc/envelope — usable volume across a temperature envelope. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(envelopeSchema))
  return runEngine(() => usableVolumeEnvelope(body), 'temperatures')
})
