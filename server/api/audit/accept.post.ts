import { auditAcceptSchema } from '#shared/schemas/audit'
import { acceptHeldRecord } from '../../services/audit'

/** Lifts a hold: the record's content as it now stands is vouched for, with the administrator's reason. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'audit.verify')
  const body = await readValidatedBody(event, validateWith(auditAcceptSchema))
  return acceptHeldRecord(user, body)
})
