#!/usr/bin/env node
// Checks a Chargewell audit export offline, with Node.js alone (no database, no server, no packages):
//
//   node scripts/check-audit-export.mjs chargewell-audit-2026-12-02.ndjson [--key 1a2b:3c4d:...]
//
// It recomputes every entry's hash and link, counts the entries, and checks the Ed25519 signature
// over the whole file with the public key in its header. --key pins that key to the fingerprint
// shown on the Admin page, so a file signed by anyone else is refused. Exit status 0: intact.
import { createHash, createPublicKey, verify } from 'node:crypto'
import { createReadStream } from 'node:fs'
import { createInterface } from 'node:readline'

const FORMAT = 'chargewell-audit-export'
const GENESIS = '0'.repeat(64)
const [file, ...rest] = process.argv.slice(2)
const pinned = rest[0] === '--key' ? rest[1] : undefined
if (!file) {
  console.error('Usage: node scripts/check-audit-export.mjs <export.ndjson> [--key <fingerprint>]')
  process.exit(2)
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
let pending
for await (const line of createInterface({ input: createReadStream(file), crlfDelay: Infinity })) {
  // The last line is the signature; every line before it is covered by the digest.
  if (pending !== undefined) {
    digest.update(`${pending}\n`)
    const value = JSON.parse(pending)
    if (!header) {
      header = value
      if (header.format !== FORMAT || header.version !== 1) problems.push(`Not a ${FORMAT} version 1 file.`)
    }
    else {
      count++
      if (value.previousHash !== previous) problems.push(`Entry ${value.id} does not link to the entry before it.`)
      else if (entryHash(value, previous) !== value.hash)
        problems.push(`Entry ${value.id}: its content does not match its hash.`)
      previous = value.hash
    }
  }
  pending = line
}
if (pending) trailer = JSON.parse(pending)
if (!header || !trailer) problems.push('The file is incomplete: no header or no signature line.')
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
  const message = Buffer.from(`${FORMAT}:1:${hex}:${count}:${previous}`)
  const key = createPublicKey({ key: spki, format: 'der', type: 'spki' })
  if (!verify(null, message, key, Buffer.from(trailer.signature, 'base64')))
    problems.push('The signature does not verify: the file was not signed by this key, or was altered.')
}

if (problems.length) {
  console.error(`NOT INTACT: ${file}`)
  for (const problem of problems.slice(0, 20)) console.error(`  - ${problem}`)
  process.exit(1)
}
console.log(
  `INTACT: ${count} entries, exported ${header.exportedAt} by ${header.exportedBy}, signed by key ${header.keyFingerprint}; last entry hash ${previous}.`,
)
