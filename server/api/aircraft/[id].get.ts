import { idParamsSchema } from '../../../shared/schemas/auth'
import { Accumulator, Aircraft } from '../../models'

/** An aircraft with the accumulators installed on it. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const aircraft = await Aircraft.findByPk(id, { include: [{ model: Accumulator, as: 'accumulators' }] })
  if (!aircraft) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Aircraft not found.' })
  return aircraft.get({ plain: true })
})
