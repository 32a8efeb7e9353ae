import { listStations } from '../../../services/organisation'

/** The organisation's stations: time zone, field elevation, how many aircraft are based there. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'fleet.manage')
  return listStations()
})
