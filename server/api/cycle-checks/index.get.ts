import { cycleCheckQuerySchema } from '#shared/schemas/cycle-check'
import { listCycleChecks } from '../../services/cycle-checks'

/** Cycle checks, newest first, withdrawn ones included (marked). */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'cycle-check.read')
  const query = await getValidatedQuery(event, validateWith(cycleCheckQuerySchema))
  return listCycleChecks(query, scope)
})
