import { stationSchema } from '#shared/schemas/organisation'
import { createStation } from '../../../services/organisation'

/** Adds a station (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'fleet.manage')
  const body = await readValidatedBody(event, validateWith(stationSchema))
  setResponseStatus(event, 201)
  return createStation(admin, body)
})
