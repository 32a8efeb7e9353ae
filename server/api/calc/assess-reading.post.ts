import { assessReadingSchema } from '#shared/schemas/calc'
import { assessReading } from '#shared/gas/charge-target'

/** POST /api/calc/assess-reading — a gauge reading against the band: in limits, low or high, and by how much. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(assessReadingSchema))
  return runEngine(() => assessReading(body), 'reading')
})
