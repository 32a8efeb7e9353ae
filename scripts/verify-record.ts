/**
 * Verifies an exported Chargewell record PDF with nothing but the file: no server, no database.
 *
 *   npm run verify-record -- record.pdf [--json]
 *
 * For each signature: valid or not, by whom, with which key, over which content, and the fields that
 * changed since it was signed; then whether the printed pages match the embedded content. Exit code
 * 0 when the record verifies, 1 when it does not, 2 when the file cannot be read as a record.
 */
import { readFile } from 'node:fs/promises'
import { verifyRecordPdf } from '../shared/utils/record-verify'

const args = process.argv.slice(2)
const json = args.includes('--json')
const file = args.find(arg => !arg.startsWith('--'))
if (!file) {
  console.error('Usage: npm run verify-record -- <record.pdf> [--json]')
  process.exit(2)
}

const report = await verifyRecordPdf(new Uint8Array(await readFile(file)))
if (json) console.log(JSON.stringify(report, null, 2))
else {
  const out: string[] = []
  out.push(`${file}: ${report.ok ? 'VERIFIED' : report.readable ? 'NOT VERIFIED' : 'CANNOT BE VERIFIED'}`)
  if (report.worksheetId !== null) out.push(`Worksheet ${report.worksheetId}${report.operator ? ` · ${report.operator}` : ''}${report.station ? ` · ${report.station}` : ''}`)
  if (report.contentHash) out.push(`Content hash (SHA-256 of the embedded content): ${report.contentHash}`)
  for (const signature of report.signatures) {
    const who = `${signature.capacity === 'performer' ? 'Performed' : 'Inspected'} by ${signature.name} (${signature.authorisationNumber ?? 'no authorisation number'}), ${signature.signedAt}`
    const status = { 'valid': 'VALID', 'invalid': 'INVALID', 'password': 'PASSWORD SIGNATURE (not provable from the file)', 'earlier-round': 'EARLIER ROUND' }[signature.status]
    out.push(`- ${status}: ${who}`)
    out.push(`  method: ${signature.method}${signature.key ? `; key ${signature.key.fingerprint} “${signature.key.name}”, registered ${signature.key.registeredAt}${signature.key.revokedAt ? `, revoked ${signature.key.revokedAt}` : ''}` : ''}`)
    if (signature.signedContentHash) out.push(`  over content ${signature.signedContentHash}`)
    for (const reason of signature.reasons) out.push(`  ${reason}`)
  }
  if (report.readable) {
    out.push(report.printed.matches
      ? `Printed pages: all ${report.printed.checked} lines match the embedded content.`
      : `Printed pages DIFFER from the embedded content in ${report.printed.mismatches.length} line(s):`)
    for (const line of report.printed.mismatches) out.push(`  missing from print: ${line}`)
  }
  for (const problem of report.problems) out.push(`Problem: ${problem}`)
  console.log(out.join('\n'))
}
process.exit(report.ok ? 0 : report.readable ? 1 : 2)
