import { idParamsSchema } from '#shared/schemas/common'
import { stationUpdateSchema } from '#shared/schemas/organisation'
import { updateStation } from '../../../services/organisation'

/** Changes a station's code, time zone or field elevation (audited; its name stays, as its aircraft name it). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'fleet.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(stationUpdateSchema))
  return updateStation(admin, id, body)
})
