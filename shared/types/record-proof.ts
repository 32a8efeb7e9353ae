import type { SignatureAssertion, SignatureMethod, SigningPayload } from './signing'
import type { SignatureCapacity, WorksheetDto } from './worksheet'

/** What an exported record PDF carries as `chargewell-record.json`: the record as printed and how it was printed. */
export interface EmbeddedRecord {
  format: 'chargewell-record-export/1'
  exportedAt: string
  operator: string
  station: string
  printedWith: { locale: string, timeZone: string, showZone: true }
  /** The page an auditor drops the file on. */
  verifyAddress: string
  /** SHA-256 of the record's field digests (server/utils/record-proof.ts). */
  contentHash: string
  /** The record's canonical content, the fields signatures are over (keys sorted). */
  canonicalContent: Record<string, unknown>
  /** The record as printed (its state, signatures and attachments' names too). */
  worksheet: WorksheetDto
}

/** One signature as `chargewell-signatures.json` carries it: what was signed, the assertion, and the key. */
export interface EmbeddedSignature {
  capacity: SignatureCapacity
  round: number
  userId: number
  name: string
  authorisationNumber: string | null
  statement: string
  signedAt: string
  method: SignatureMethod | null
  payload: SigningPayload | null
  signedFields: Record<string, string> | null
  assertion: SignatureAssertion | null
  key: {
    name: string
    credentialId: string
    /** COSE public key, base64url. */
    publicKey: string
    fingerprint: string
    registeredAt: string
    revokedAt: string | null
  } | null
}

export interface EmbeddedSignatures {
  format: 'chargewell-signatures/1'
  signatures: EmbeddedSignature[]
}

/** What the verifier says of one signature. */
export interface SignatureVerdict {
  capacity: SignatureCapacity
  round: number
  name: string
  authorisationNumber: string | null
  signedAt: string
  method: SignatureMethod | 'password (before passkeys)'
  /**
   * valid: the key signed exactly this content; invalid: it did not (reasons say why); password: not provable
   * from the file.
   */
  status: 'valid' | 'invalid' | 'password' | 'earlier-round'
  key: { fingerprint: string, name: string, registeredAt: string, revokedAt: string | null } | null
  /** The content hash the signature is over. */
  signedContentHash: string | null
  /** Fields of the record that differ from what was signed. */
  changedFields: string[]
  reasons: string[]
}

export interface RecordVerification {
  /** Every signature of the current round valid (or honestly a password signature), and the print matches. */
  ok: boolean
  /** The file could be read as a Chargewell record at all. */
  readable: boolean
  worksheetId: number | null
  operator: string | null
  station: string | null
  contentHash: string | null
  signatures: SignatureVerdict[]
  printed: { checked: number, matches: boolean, mismatches: string[] }
  problems: string[]
}
