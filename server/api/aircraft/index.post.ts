import { aircraftSchema } from '#shared/schemas/aircraft'
import { createAircraft } from '../../services/aircraft'

/** Adds an aircraft to the fleet. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  const body = await readValidatedBody(event, validateWith(aircraftSchema))
  setResponseStatus(event, 201)
  return createAircraft(user, body)
})
