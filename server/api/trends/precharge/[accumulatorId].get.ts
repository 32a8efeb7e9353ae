import { z } from 'zod'
import { Accumulator, Aircraft } from '../../../models'

const paramsSchema = z.object({ accumulatorId: z.coerce.number({ invalid_type_error: 'The id must be a number.' }).int().positive() })

/** One unit's readings carried to the reference temperature, the band, the fit and the flag. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { accumulatorId } = await getValidatedRouterParams(event, validateWith(paramsSchema))
  const accumulator = await Accumulator.findByPk(accumulatorId, { include: [{ model: Aircraft, as: 'aircraft' }] })
  if (!accumulator) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Accumulator not found.' })
  return unitTrend(accumulator)
})
