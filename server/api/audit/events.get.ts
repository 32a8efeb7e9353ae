import { auditEventQuerySchema } from '#shared/schemas/audit'
import { auditEvents } from '../../services/users'

/** The audit trail in words, newest first: who changed what (role changes, voids, corrections …). */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'audit.verify')
  const query = await getValidatedQuery(event, validateWith(auditEventQuerySchema))
  return auditEvents(query)
})
