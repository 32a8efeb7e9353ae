import { importUnits } from '../../services/accumulators'

/** Imports accumulators (installed where a registration is given): every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  return importUnits(event, user)
})
