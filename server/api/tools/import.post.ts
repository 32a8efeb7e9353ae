import { importTools } from '../../services/tools'

/** Imports gauges and carts from CSV: every row valid, or nothing imported. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'tool.manage')
  return importTools(event, user)
})
