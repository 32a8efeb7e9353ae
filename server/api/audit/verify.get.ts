import { noQuerySchema } from '#shared/schemas/common'
import type { AuditVerifyAnswer } from '#shared/types/audit'
import { verifyTrail } from '../../services/audit'

/**
 * Walks the hash-chained audit trail, checks its sealed head, and compares every record with the
 * content its newest entry vouches for, in one read snapshot. Also gives the export signing key's
 * fingerprint, to pin when checking an export offline.
 */
export default defineEventHandler(async (event): Promise<AuditVerifyAnswer> => {
  await requireAbility(event, 'audit.verify')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return verifyTrail()
})
