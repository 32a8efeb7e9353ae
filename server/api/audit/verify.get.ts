import type { AuditVerifyAnswer } from '../../../shared/types/audit'
import { auditSigningKey, verifyAuditChain } from '../../database/audit-chain'

/**
 * Walks the hash-chained audit trail, checks its sealed head, and compares every record with
 * the content its newest entry vouches for (admin). Also gives the export signing key's
 * fingerprint, to pin when checking an export offline.
 */
export default defineEventHandler(async (event): Promise<AuditVerifyAnswer> => {
  await requireRole(event, 'admin')
  return { ...await verifyAuditChain(), signingKey: auditSigningKey() }
})
