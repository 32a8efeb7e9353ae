import { verifyAuditChain } from '../../database/audit-chain'

/** Walks the hash-chained audit trail and reports the first broken link, if any (admin). */
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return verifyAuditChain()
})
