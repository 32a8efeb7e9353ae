import { listOperators } from '../../../services/organisation'

/** The operators whose aircraft the organisation maintains, its own fleet first. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'fleet.manage')
  return listOperators()
})
