import { sha256 } from '@noble/hashes/sha2.js'
import { bytesToHex } from '@noble/hashes/utils.js'
import type { SigningPayload } from '../types/signing'
import type { SignatureCapacity, WorksheetDto } from '../types/worksheet'

/**
 * What a signature is over, computed the same way by the server when it asks for a signature and
 * by anyone verifying an exported record (scripts/verify-record.ts, or the verify page in the browser:
 * no server, no database). Pure and isomorphic: nothing here reads configuration, the database or Node.
 *
 * The record's canonical content is its fields in canonical JSON (keys sorted, nothing undefined).
 * Each leaf field is digested (SHA-256 of its canonical JSON) under its path, e.g.
 * `content.asFound.reading.value`; the content hash is the SHA-256 of those digests. A signature
 * keeps the digests it was made over, so a verifier names the field that changed, not only that
 * something did. A passkey signs the payload (record, round, capacity, signer, statement, content
 * hash): the SHA-256 of its canonical JSON is the WebAuthn challenge.
 */

export const RECORD_FORMAT = 'chargewell-record/1'

/** A worksheet's fields a signature is over (not its state, version or signatures: they change as it is signed). */
export type SignedRecordSource = Pick<
  WorksheetDto,
  'id' | 'round' | 'workOrder' | 'reason' | 'correctsId' | 'content' | 'results' | 'engineVersion' | 'serviceable'
> & {
  performer: { id: number }
  attachments: {
    id: number
    kind: string
    originalName: string
    mimeType: string
    sizeBytes: number
    sha256?: string | null
  }[]
}

/** A value in canonical form: keys sorted, dates as ISO strings, nothing undefined. */
export function canonicalValue(value: unknown): unknown {
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? 'invalid date' : value.toISOString()
  if (Array.isArray(value)) return value.map(canonicalValue)
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.keys(value)
        .sort()
        .filter(key => (value as Record<string, unknown>)[key] !== undefined)
        .map(key => [key, canonicalValue((value as Record<string, unknown>)[key])]),
    )
  }
  return value
}

export function canonicalJson(value: unknown): string {
  return JSON.stringify(canonicalValue(value))
}

const utf8 = (data: string | Uint8Array) => (typeof data === 'string' ? new TextEncoder().encode(data) : data)

export function sha256Hex(data: string | Uint8Array): string {
  return bytesToHex(sha256(utf8(data)))
}

const BASE64URL = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_'

/** Bytes as base64url without padding (what WebAuthn uses), in any JavaScript runtime. */
export function toBase64url(bytes: Uint8Array): string {
  let out = ''
  for (let index = 0; index < bytes.length; index += 3) {
    const [a = 0, b = 0, c = 0] = [bytes[index], bytes[index + 1], bytes[index + 2]]
    const chunk = (a << 16) | (b << 8) | c
    const length = Math.min(3, bytes.length - index)
    for (let digit = 0; digit <= length; digit++) out += BASE64URL[(chunk >> (18 - 6 * digit)) & 63]
  }
  return out
}

export function fromBase64url(text: string): Uint8Array {
  const clean = text.replace(/=+$/, '')
  const bytes: number[] = []
  let buffer = 0
  let bits = 0
  for (const character of clean) {
    const value = BASE64URL.indexOf(character === '+' ? '-' : character === '/' ? '_' : character)
    if (value < 0) throw new Error('Not base64url.')
    buffer = (buffer << 6) | value
    bits += 6
    if (bits >= 8) {
      bits -= 8
      bytes.push((buffer >> bits) & 0xFF)
    }
  }
  return new Uint8Array(bytes)
}

/** The record's content a signature is over. */
export function signedRecordOf(source: SignedRecordSource): Record<string, unknown> {
  return canonicalValue({
    format: RECORD_FORMAT,
    worksheetId: source.id,
    round: source.round,
    workOrder: source.workOrder,
    reason: source.reason,
    correctsId: source.correctsId,
    performerId: source.performer.id,
    content: source.content,
    results: source.results,
    engineVersion: source.engineVersion,
    serviceable: source.serviceable,
    attachments: source.attachments.map(({ id, kind, originalName, mimeType, sizeBytes, sha256 }) => ({
      id, kind, originalName, mimeType, sizeBytes, sha256: sha256 ?? null,
    })),
  }) as Record<string, unknown>
}

/** Each leaf field's SHA-256 under its path (`content.asFound.reading.value`, `attachments[0].sha256`). */
export function fieldDigests(record: unknown): Record<string, string> {
  const digests: Record<string, string> = {}
  const walk = (value: unknown, path: string) => {
    if (Array.isArray(value) && value.length) value.forEach((item, index) => walk(item, `${path}[${index}]`))
    else if (value && typeof value === 'object' && !Array.isArray(value) && Object.keys(value).length)
      for (const [key, item] of Object.entries(value)) walk(item, path ? `${path}.${key}` : key)
    else digests[path] = sha256Hex(canonicalJson(value ?? null))
  }
  walk(canonicalValue(record), '')
  return canonicalValue(digests) as Record<string, string>
}

/** The record's content hash: the SHA-256 of its field digests. */
export function contentHashOf(digests: Record<string, string>): string {
  return sha256Hex(canonicalJson(digests))
}

/** The fields whose digests differ: changed, added or removed since they were signed. */
export function changedFields(signed: Record<string, string>, now: Record<string, string>): string[] {
  const paths = new Set([...Object.keys(signed), ...Object.keys(now)])
  return [...paths].filter(path => signed[path] !== now[path]).sort()
}

export function signingPayload(fields: {
  worksheetId: number
  round: number
  capacity: SignatureCapacity
  signer: { id: number, name: string, authorisationNumber: string | null }
  statement: string
  contentHash: string
}): SigningPayload {
  return { format: 'chargewell-signature/1', ...fields }
}

/** The WebAuthn challenge for a payload: the SHA-256 of its canonical JSON, base64url. */
export function challengeOf(payload: SigningPayload): string {
  return toBase64url(sha256(utf8(canonicalJson(payload))))
}

/** A public key's fingerprint: SHA-256 of the key, the first 16 hex digits in groups of four. */
export function keyFingerprint(publicKeyBase64url: string): string {
  const hex = sha256Hex(fromBase64url(publicKeyBase64url))
  return hex.slice(0, 16).match(/.{4}/g)!.join(' ')
}
