import { requiredVolumeSchema } from '#shared/schemas/calc'
import { requiredVolume } from '#shared/gas/usable-volume'

/** POST /api/calc/required-volume — gas volume needed for a usable volume or N applications. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(requiredVolumeSchema))
  return runEngine(() => requiredVolume(body), 'precharge')
})
