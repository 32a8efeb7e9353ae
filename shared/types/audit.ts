/** A record whose current content no longer matches what the audit trail vouches for. */
export interface RecordProblem { entity: string, entityId: string, reason: string }

/** What `GET /api/audit/verify` answers. */
export interface ChainReport {
  ok: boolean
  /** Entries walked. */
  checked: number
  /** Records whose content was compared with their newest audit entry. */
  recordsChecked: number
  head: { eventCount: number | null, sealed: boolean, sealChecked: boolean }
  /** The first entry whose stored hash or link does not match. */
  firstBroken?: { id: number, reason: string }
  /** Problems with the chain's sealed head (count, last entry, seal). */
  headProblems: string[]
  /** The first record whose current content no longer matches what the trail vouches for. */
  firstMismatch?: RecordProblem
  mismatches: number
  /** Up to 50 record problems, in record order. */
  records: RecordProblem[]
}

export interface AuditVerifyAnswer extends ChainReport {
  /** The key that signs exports: pin its fingerprint when checking an export offline. */
  signingKey: { publicKey: string, fingerprint: string } | null
}
