import { aircraftSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Aircraft } from '../../models'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'admin')
  const body = await readValidatedBody(event, validateWith(aircraftSchema))
  const aircraft = await uniqueOr409(() => writeTransaction(async (transaction) => {
    const created = await Aircraft.create(body, { transaction })
    await appendAudit({ actorId: user.id, entity: 'aircraft', entityId: String(created.id), action: 'created', detail: body }, transaction)
    return created
  }), 'An aircraft with that registration or fleet number is already registered.')
  setResponseStatus(event, 201)
  return aircraft.get({ plain: true })
})
