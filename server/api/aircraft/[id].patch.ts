import { idParamsSchema } from '../../../shared/schemas/auth'
import { aircraftUpdateSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Aircraft } from '../../models'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(aircraftUpdateSchema))
  const aircraft = await Aircraft.findByPk(id)
  if (!aircraft) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Aircraft not found.' })
  await uniqueOr409(() => writeTransaction(async (transaction) => {
    await aircraft.update(body, { transaction })
    await appendAudit({ actorId: user.id, entity: 'aircraft', entityId: String(aircraft.id), action: 'updated', detail: body }, transaction)
  }), 'Another aircraft already has that registration or fleet number.')
  return aircraft.get({ plain: true })
})
