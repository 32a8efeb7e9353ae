import { importAircraft } from '../../services/aircraft'

/** Imports aircraft from CSV (columns as the export): every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  return importAircraft(event, user)
})
