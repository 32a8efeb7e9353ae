import { aircraftUpdateSchema } from '#shared/schemas/aircraft'
import { idParamsSchema } from '#shared/schemas/common'
import { updateAircraft } from '../../services/aircraft'

/** Corrects an aircraft's details, or takes it out of service. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(aircraftUpdateSchema))
  return updateAircraft(user, id, body)
})
