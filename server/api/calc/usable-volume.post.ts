import { usableVolumeSchema } from '#shared/schemas/calc'
import { usableVolume } from '#shared/gas/usable-volume'

/** POST /api/calc/usable-volume — fluid delivered between maximum and minimum working pressure. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(usableVolumeSchema))
  return runEngine(() => usableVolume(body), 'precharge')
})
