import { cycleCheckQuerySchema } from '../../../shared/schemas/cycle-check'
import { Aircraft, CycleCheck } from '../../models'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(cycleCheckQuerySchema))
  const { total, rows } = await pageOf(CycleCheck, {
    where: { ...(query.aircraftId ? { aircraftId: query.aircraftId } : {}), ...(query.system ? { system: query.system } : {}) },
    include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }],
    order: [['checkedAt', 'DESC']],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, items: rows.map(row => ({ ...row.get({ plain: true }), registration: (row as CycleCheck & { aircraft?: Aircraft }).aircraft?.registration })) }
})
