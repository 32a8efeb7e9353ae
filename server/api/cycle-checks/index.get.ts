import { cycleCheckQuerySchema } from '../../../shared/schemas/cycle-check'
import { Aircraft, CycleCheck } from '../../models'
import { toCycleCheckDto } from '../../services/cycle-checks'

/** Cycle checks, newest first, withdrawn ones included (marked). */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'cycle-check.read')
  const query = await getValidatedQuery(event, validateWith(cycleCheckQuerySchema))
  const { total, rows } = await pageOf(CycleCheck, {
    where: { ...(query.aircraftId ? { aircraftId: query.aircraftId } : {}), ...(query.system ? { system: query.system } : {}) },
    include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }],
    order: [['checkedAt', 'DESC'], ['id', 'DESC']],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: rows.map(toCycleCheckDto) }
})
