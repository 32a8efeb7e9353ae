#!/usr/bin/env node
// Checks a Chargewell audit export offline, with Node.js alone (no database, no server, no packages):
//
//   node scripts/check-audit-export.mjs chargewell-audit-2026-12-02.ndjson --key 1a2b:3c4d:...
//
// It recomputes every entry's hash and link, counts the entries, and checks the Ed25519 signature
// over the whole file (and, from version 2, the sealed head) with the public key in its header.
// A period's export (version 3) is checked from its anchor: the hash of the entry before the period,
// which is the last entry hash the export of the period before printed.
// --key pins that key to the fingerprint shown on the Admin page, so a file re-signed by anyone else
// is refused. Without --key it refuses to judge, unless told --trust-embedded-key (then it only shows
// that the file is as its own key signed it). Exit status 0: intact; 1: not intact; 2: cannot check.
import { createHash, createPublicKey, verify } from 'node:crypto'
import { createReadStream } from 'node:fs'
import { createInterface } from 'node:readline'

const FORMAT = 'chargewell-audit-export'
const GENESIS = '0'.repeat(64)
const [file, ...rest] = process.argv.slice(2)
const pinned = rest.includes('--key') ? rest[rest.indexOf('--key') + 1] : undefined
const trustEmbedded = rest.includes('--trust-embedded-key')
if (!file || (rest.includes('--key') && !pinned)) {
  console.error('Usage: node scripts/check-audit-export.mjs <export.ndjson> --key <fingerprint> (or --trust-embedded-key)')
  process.exit(2)
}
if (!pinned && !trustEmbedded) {
  console.error(
    'Give the export signing key\'s fingerprint from the Admin page with --key: anyone can re-sign an altered file '
    + 'with a key of their own. (--trust-embedded-key checks the file against the key it carries, which proves less.)',
  )
  process.exit(2)
}
/** Malformed input is answered in one plain line, never a stack trace. */
function unreadable(reason) {
  console.error(`NOT INTACT: ${file}: ${reason}`)
  process.exit(1)
}
function parse(line, number) {
  try {
    return JSON.parse(line)
  }
  catch {
    return unreadable(`line ${number} is not a line of an audit export (not JSON; a stray line break or carriage return?).`)
  }
}

function canonical(value) {
  if (Array.isArray(value)) return value.map(canonical)
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.keys(value)
        .sort()
        .filter(key => value[key] !== undefined)
        .map(key => [key, canonical(value[key])]),
    )
  }
  return value
}

function entryHash(entry, previousHash) {
  const fields
    = entry.hashVersion === 1
      ? [previousHash, entry.at, entry.actorId, entry.entity, entry.entityId, entry.action, canonical(entry.detail)]
      : [
          2,
          previousHash,
          entry.at,
          entry.actorId,
          entry.entity,
          entry.entityId,
          entry.action,
          canonical(entry.detail),
          entry.recordHash ?? null,
        ]
  return createHash('sha256').update(JSON.stringify(fields)).digest('hex')
}

const problems = []
const digest = createHash('sha256')
let header
let trailer
let previous = GENESIS
let count = 0
// A period export: how many of its entries are dated within the period (the rest keep the run unbroken).
let dated = 0
let pending
let lineNumber = 0
const input = createReadStream(file)
input.on('error', error => unreadable(error.code === 'ENOENT' ? 'no such file.' : String(error.message)))
for await (const line of createInterface({ input, crlfDelay: Infinity })) {
  lineNumber++
  // The last line is the signature; every line before it is covered by the digest.
  if (pending !== undefined) {
    digest.update(`${pending}\n`)
    const value = parse(pending, lineNumber - 1)
    if (!value || typeof value !== 'object') unreadable(`line ${lineNumber - 1} is not an object.`)
    if (!header) {
      header = value
      if (header.format !== FORMAT || ![1, 2, 3].includes(header.version))
        unreadable(`not a ${FORMAT} file (version 1, 2 or 3).`)
      // Version 3, a period's run of the chain: its first entry links to the anchor, not to the start.
      if (header.version === 3) {
        if (!header.period || !header.anchor || !/^[0-9a-f]{64}$/.test(String(header.anchor.hash)))
          unreadable('a period export without its period or its anchor.')
        previous = header.anchor.hash
      }
    }
    else {
      count++
      const { fromInstant, untilInstant } = header.period ?? {}
      if (header.version === 3 && value.at >= fromInstant && value.at < untilInstant) dated++
      if (value.previousHash !== previous) problems.push(`Entry ${value.id} does not link to the entry before it.`)
      else if (entryHash(value, previous) !== value.hash)
        problems.push(`Entry ${value.id}: its content does not match its hash.`)
      previous = value.hash
    }
  }
  pending = line
}
if (pending) trailer = parse(pending, lineNumber)
if (!header || !trailer || typeof trailer.signature !== 'string' || typeof header.publicKey !== 'string')
  unreadable('the file is incomplete: no header or no signature line (cut short?).')
else {
  const hex = digest.digest('hex')
  if (trailer.digest !== hex) problems.push('The file was changed after it was signed (its digest differs).')
  if (trailer.entries !== count)
    problems.push(`The signature line counts ${trailer.entries} entries; the file holds ${count}.`)
  if (trailer.lastHash !== previous) problems.push('The last entry is not the one that was signed.')
  const spki = Buffer.from(header.publicKey, 'base64')
  const fingerprint = createHash('sha256').update(spki).digest('hex').slice(0, 32).match(/.{4}/g).join(':')
  if (fingerprint !== header.keyFingerprint)
    problems.push('The header\'s key fingerprint does not belong to its public key.')
  if (pinned && pinned.toLowerCase() !== fingerprint)
    problems.push(`Signed with key ${fingerprint}, not the expected ${pinned}.`)
  const message = Buffer.from(header.version === 1
    ? `${FORMAT}:1:${hex}:${count}:${previous}`
    : `${FORMAT}:${header.version}:${hex}:${count}:${previous}:${JSON.stringify(canonical(trailer.sealedHead ?? null))}`)
  if (header.version === 1) problems.push('A version 1 export: its sealed head is not covered by the signature.')
  let key
  try {
    key = createPublicKey({ key: spki, format: 'der', type: 'spki' })
  }
  catch {
    unreadable('the header\'s public key is not a key.')
  }
  if (!verify(null, message, key, Buffer.from(trailer.signature, 'base64')))
    problems.push('The signature does not verify: the file was not signed by this key, or was altered.')
}

if (problems.length) {
  console.error(`NOT INTACT: ${file}`)
  for (const problem of problems.slice(0, 20)) console.error(`  - ${problem}`)
  process.exit(1)
}
const period = header.version === 3
  ? ` (${dated} dated in the period, the rest between them in the chain) of the period ${header.period.from} to ${header.period.to} (UTC days), linked to the anchor ${header.anchor.entryId === null ? '(the start of the trail)' : `entry ${header.anchor.entryId}`} hash ${header.anchor.hash} — the last entry hash of the export of the period before,`
  : ''
console.log(
  `INTACT${pinned ? '' : ' (checked against the key the file carries, not a pinned one)'}: ${count} entries${period} exported ${header.exportedAt} by ${header.exportedBy}, signed by key ${header.keyFingerprint}; last entry hash ${previous}.`,
)
