import { verifyAuthenticationResponse } from '@simplewebauthn/server'
import type { EmbeddedRecord, EmbeddedSignature, EmbeddedSignatures, RecordVerification, SignatureVerdict } from '../types/record-proof'
import { challengeOf, changedFields, contentHashOf, fieldDigests, fromBase64url, signedRecordOf } from './record-proof'
import { displayFormat } from './station-time'
import { worksheetRecordSections } from './worksheet-record'

/**
 * Verifies an exported record PDF on its own: no server, no database, nothing but the file. Runs in
 * Node (`npm run verify-record`, scripts/verify-record.ts) and in the browser (the verify page: the file
 * never leaves the auditor's device). For each signature it says
 * valid or not, by whom, with which key, over which content, and which fields changed since; and
 * whether the printed pages say what the embedded content says.
 */

const RECORD_FILE = 'chargewell-record.json'
const SIGNATURES_FILE = 'chargewell-signatures.json'
/** Text below this height is the page's footer, not the record. */
const FOOTER_TOP = 40

type PdfJs = typeof import('pdfjs-dist/legacy/build/pdf.mjs')
let pdfjs: Promise<PdfJs> | undefined

/** pdf.js, loaded once; a browser caller sets its worker's address first (see `useRecordVerification`). */
export function loadPdfJs(): Promise<PdfJs> {
  pdfjs ??= import('pdfjs-dist/legacy/build/pdf.mjs')
  return pdfjs
}

const latin1 = (bytes: Uint8Array) => String.fromCharCode(...bytes)

const squeeze = (text: string) => text.replace(/\s+/g, '')

function unreadable(problem: string): RecordVerification {
  return {
    ok: false,
    readable: false,
    worksheetId: null,
    operator: null,
    station: null,
    contentHash: null,
    signatures: [],
    printed: { checked: 0, matches: false, mismatches: [] },
    problems: [problem],
  }
}

async function verifySignature(
  signature: EmbeddedSignature,
  record: EmbeddedRecord,
  digests: Record<string, string>,
): Promise<SignatureVerdict> {
  const worksheet = record.worksheet
  const reasons: string[] = []
  const verdict: SignatureVerdict = {
    capacity: signature.capacity,
    round: signature.round,
    name: signature.name,
    authorisationNumber: signature.authorisationNumber,
    signedAt: signature.signedAt,
    method: signature.method ?? 'password (before passkeys)',
    status: 'invalid',
    key: signature.key
      ? {
          fingerprint: signature.key.fingerprint,
          name: signature.key.name,
          registeredAt: signature.key.registeredAt,
          revokedAt: signature.key.revokedAt,
        }
      : null,
    signedContentHash: signature.payload?.contentHash ?? null,
    changedFields: [],
    reasons,
  }
  if (signature.round !== worksheet.round) {
    verdict.status = 'earlier-round'
    reasons.push(`Made in signing round ${signature.round}; the record was returned and signed again in round ${worksheet.round}, so it is not over this content.`)
    return verdict
  }
  if (signature.signedFields) {
    verdict.changedFields = changedFields(signature.signedFields, digests)
    if (verdict.changedFields.length)
      reasons.push(`The record differs from what was signed, in ${verdict.changedFields.length === 1 ? 'the field' : 'the fields'} ${verdict.changedFields.slice(0, 12).join(', ')}${verdict.changedFields.length > 12 ? ` and ${verdict.changedFields.length - 12} more` : ''}.`)
  }
  if (signature.method !== 'passkey') {
    reasons.push(
      signature.signedFields
        ? 'Made with a password: Chargewell\'s server vouches for who signed; the file alone cannot prove it.'
        : 'Made with a password before passkeys existed: the file cannot prove who signed or what; only Chargewell\'s audit trail vouches for it.',
    )
    verdict.status = verdict.changedFields.length ? 'invalid' : 'password'
    return verdict
  }
  const { payload, assertion, key, signedFields } = signature
  if (!payload || !assertion || !key || !signedFields) {
    reasons.push('The passkey signature is incomplete: its payload, assertion or key is missing from the file.')
    return verdict
  }
  if (contentHashOf(signedFields) !== payload.contentHash)
    reasons.push('The field digests kept with the signature do not give the content hash it signed.')
  const sameSignature = payload.worksheetId === worksheet.id && payload.round === signature.round
    && payload.capacity === signature.capacity
  if (!sameSignature)
    reasons.push(`The payload names worksheet ${payload.worksheetId}, round ${payload.round}, ${payload.capacity}: not this signature.`)
  if (payload.signer.name !== signature.name || payload.signer.id !== signature.userId)
    reasons.push(`The payload was signed by ${payload.signer.name}, not ${signature.name}.`)
  if (assertion.credentialId !== key.credentialId) reasons.push(`The assertion was made by another credential than the key ${key.fingerprint}.`)
  let origin = ''
  try {
    origin = (JSON.parse(new TextDecoder().decode(fromBase64url(assertion.clientDataJSON))) as { origin?: string }).origin ?? ''
    new URL(origin)
  }
  catch {
    reasons.push('The assertion\'s client data cannot be read.')
  }
  if (origin) {
    try {
      const result = await verifyAuthenticationResponse({
        response: {
          id: assertion.credentialId,
          rawId: assertion.credentialId,
          type: 'public-key',
          clientExtensionResults: {},
          response: {
            authenticatorData: assertion.authenticatorData,
            clientDataJSON: assertion.clientDataJSON,
            signature: assertion.signature,
            ...(assertion.userHandle ? { userHandle: assertion.userHandle } : {}),
          },
        },
        expectedChallenge: challengeOf(payload),
        expectedOrigin: origin,
        expectedRPID: new URL(origin).hostname,
        credential: { id: key.credentialId, publicKey: fromBase64url(key.publicKey), counter: 0 },
        requireUserVerification: false,
      })
      if (!result.verified) reasons.push(`The signature does not verify with key ${key.fingerprint}.`)
    }
    catch (error) {
      const message = (error as Error).message
      reasons.push(/challenge/i.test(message)
        ? `Key ${key.fingerprint} did not sign this payload (its challenge is another content's).`
        : `The signature does not verify with key ${key.fingerprint}: ${message}`)
    }
  }
  if (key.revokedAt && new Date(key.revokedAt) <= new Date(signature.signedAt))
    reasons.push(`Key ${key.fingerprint} was revoked on ${key.revokedAt}, before this signature (${signature.signedAt}).`)
  verdict.status = reasons.length ? 'invalid' : 'valid'
  return verdict
}

/** The printed text of each page, the footer left out, in drawing order. */
async function printedText(document: Awaited<ReturnType<PdfJs['getDocument']>['promise']>): Promise<string> {
  let text = ''
  for (let number = 1; number <= document.numPages; number++) {
    const page = await document.getPage(number)
    const content = await page.getTextContent()
    for (const item of content.items) {
      if ('str' in item && item.transform[5] >= FOOTER_TOP) text += item.str
    }
  }
  return text
}

export async function verifyRecordPdf(bytes: Uint8Array): Promise<RecordVerification> {
  const head = latin1(bytes.subarray(0, 8))
  if (!head.startsWith('%PDF-')) return unreadable('This is not a PDF file.')
  const tail = latin1(bytes.subarray(Math.max(0, bytes.length - 1024)))
  const truncated = !tail.includes('%%EOF')
  const { getDocument } = await loadPdfJs()
  let document
  try {
    document = await getDocument({
      data: new Uint8Array(bytes),
      isEvalSupported: false,
      disableFontFace: true,
      useSystemFonts: false,
      verbosity: 0,
    }).promise
  }
  catch (error) {
    return unreadable(`The PDF cannot be read${truncated ? ' (it is truncated: no end-of-file marker)' : ''}: ${(error as Error).message}`)
  }
  try {
    const files = (await document.getAttachments()) as Record<string, { filename: string, content: Uint8Array }> | null
    const read = <T>(name: string): T | null => {
      const file = files?.[name]
      if (!file) return null
      try {
        return JSON.parse(new TextDecoder().decode(file.content)) as T
      }
      catch {
        return null
      }
    }
    const record = read<EmbeddedRecord>(RECORD_FILE)
    const signed = read<EmbeddedSignatures>(SIGNATURES_FILE)
    if (!record?.worksheet || !signed?.signatures) {
      return unreadable(truncated
        ? 'The file is truncated (no end-of-file marker) and its embedded record cannot be read.'
        : 'This PDF carries no Chargewell record: the embedded content or signatures are missing.')
    }
    const problems: string[] = []
    if (truncated) problems.push('The file is truncated: it has no end-of-file marker.')
    const canonical = signedRecordOf(record.worksheet)
    const digests = fieldDigests(canonical)
    const embeddedCanonical = record.canonicalContent
      ? changedFields(fieldDigests(record.canonicalContent), digests)
      : []
    if (embeddedCanonical.length) {
      problems.push(`The embedded canonical content differs from the printed record in ${embeddedCanonical.slice(0, 12).join(', ')}.`)
    }
    const contentHash = contentHashOf(digests)
    if (record.contentHash !== contentHash)
      problems.push(`The content hash written in the file (${record.contentHash}) is not the hash of its embedded content (${contentHash}).`)
    const signatures = []
    for (const signature of signed.signatures) signatures.push(await verifySignature(signature, record, digests))
    const current = signatures.filter(verdict => verdict.status !== 'earlier-round')
    if (!current.length) problems.push('The record carries no signature of its current round.')

    const expected = worksheetRecordSections(record.worksheet, displayFormat(record.printedWith))
      .flatMap(section => [section.title, ...section.lines.map(line => (line.label ? `${line.label}: ${line.text}` : line.text))])
    const printed = squeeze(await printedText(document))
    const mismatches = expected.filter(line => !printed.includes(squeeze(line)))
    return {
      ok: problems.length === 0 && mismatches.length === 0 && current.length > 0 && current.every(verdict => verdict.status === 'valid' || verdict.status === 'password'),
      readable: true,
      worksheetId: record.worksheet.id,
      operator: record.operator || null,
      station: record.station || null,
      contentHash,
      signatures,
      printed: { checked: expected.length, matches: mismatches.length === 0, mismatches: mismatches.slice(0, 20) },
      problems,
    }
  }
  finally {
    await document.destroy()
  }
}
