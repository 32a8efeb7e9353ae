/**
 * Signatures an auditor verifies without trusting the server: passkeys registered and revoked, the
 * organisation's signing rule per role, a passkey signature bound to the record's exact content,
 * and the exported record PDF checked by the verifier (the same code `npm run verify-record` runs)
 * — valid, edited in the database, a foreign key, a truncated file.
 */
import { execFile } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { promisify } from 'node:util'
import jsQR from 'jsqr'
import { PNG } from 'pngjs'
import { beforeAll, describe, expect, it } from 'vitest'
import type { EmbeddedSignatures } from '../../shared/types/record-proof'
import { verifyRecordPdf } from '../../shared/utils/record-verify'
import QRCode from 'qrcode'
import { api, DEMO, DEMO_PASSWORD, signIn, upload } from '../support/api'
import { asText, sql } from '../support/database'
import { baseURL, fileDatabase } from '../support/file-server'
import { readEmbeddedJson, withEmbeddedJson } from '../support/record-pdf'
import { SoftwareAuthenticator } from '../support/software-authenticator'
import { fillWorksheet, GAS_TEMPERATURE, unitAt } from '../support/worksheet-flow'

const run = promisify(execFile)
const cookies: Record<string, string> = {}
const keys: Record<string, SoftwareAuthenticator> = {}

async function register(who: 'technician' | 'inspector', name: string): Promise<SoftwareAuthenticator> {
  const authenticator = new SoftwareAuthenticator(baseURL())
  const started = await api('/api/me/passkeys/options', { method: 'POST', cookie: cookies[who] })
  expect(started.status).toBe(200)
  const registered = await api('/api/me/passkeys', {
    cookie: cookies[who],
    body: { name, ticket: started.body.ticket, response: authenticator.register(started.body.options) },
  })
  expect(registered.status, JSON.stringify(registered.body)).toBe(201)
  return authenticator
}

/** Signs (performer) or countersigns (inspector) with a passkey, over what the server says would be signed now. */
async function signWith(authenticator: SoftwareAuthenticator, who: 'technician' | 'inspector', worksheetId: number) {
  const capacity = who === 'technician' ? 'performer' : 'inspector'
  const options = await api(`/api/worksheets/${worksheetId}/signing-options?capacity=${capacity}`, { cookie: cookies[who] })
  expect(options.status, JSON.stringify(options.body)).toBe(200)
  const assertion = authenticator.assert(options.body.passkey.challenge)
  return api(`/api/worksheets/${worksheetId}/${who === 'technician' ? 'sign' : 'countersign'}`, {
    cookie: cookies[who],
    body: { certify: true, passkey: assertion },
  })
}

async function readyToSign(registration: string, position: RegExp): Promise<number> {
  const unit = await unitAt(cookies.technician!, registration, position)
  const flow = await fillWorksheet(cookies.technician!, unit.id)
  await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
  await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
  return flow.id
}

async function recordPdf(worksheetId: number): Promise<Uint8Array> {
  const response = await fetch(`${baseURL()}/api/worksheets/${worksheetId}/pdf`, { headers: { cookie: cookies.engineer! } })
  expect(response.status).toBe(200)
  return new Uint8Array(await response.arrayBuffer())
}

let released: number
let photo: Uint8Array

beforeAll(async () => {
  for (const role of ['technician', 'inspector', 'engineer', 'admin'] as const) cookies[role] = await signIn(DEMO[role])
  keys.technician = await register('technician', 'Security key, blue')
  keys.inspector = await register('inspector', 'Tablet 3, hangar B')
  const id = await readyToSign('QX-FMB', /Normal brake/)
  // A real PNG as the gauge photo, so the record draws it.
  photo = new Uint8Array(await QRCode.toBuffer('gauge photo stand-in', { type: 'png', width: 160 }))
  const attached = await upload('/api/attachments', { worksheetId: String(id), kind: 'gauge-photo', fileName: 'gauge-1420.png' }, { name: 'gauge-1420.png', bytes: photo, type: 'image/png' }, cookies.technician)
  expect(attached.status, JSON.stringify(attached.body)).toBe(201)
  expect((await signWith(keys.technician, 'technician', id)).status).toBe(200)
  const countersigned = await signWith(keys.inspector, 'inspector', id)
  expect(countersigned.status, JSON.stringify(countersigned.body)).toBe(200)
  released = id
})

describe('passkeys as signing credentials', () => {
  it('each user keeps a register of their keys; a registration needs its own sealed ticket', async () => {
    const listed = await api('/api/me/passkeys', { cookie: cookies.technician })
    expect(listed.body).toHaveLength(1)
    expect(listed.body[0]).toMatchObject({ name: 'Security key, blue', revokedAt: null, transports: ['usb'] })
    expect(listed.body[0].fingerprint).toMatch(/^[0-9a-f]{4}( [0-9a-f]{4}){3}$/)
    // Another user's ticket (the inspector's) is refused, naming the ticket.
    const other = await api('/api/me/passkeys/options', { method: 'POST', cookie: cookies.inspector })
    const stray = new SoftwareAuthenticator(baseURL())
    const refused = await api('/api/me/passkeys', { cookie: cookies.technician, body: { name: 'Stray', ticket: other.body.ticket, response: stray.register(other.body.options) } })
    expect(refused.status).toBe(422)
    expect(refused.body.data.field).toBe('ticket')
    const unnamed = await api('/api/me/passkeys', { cookie: cookies.technician, body: { name: ' ', ticket: other.body.ticket, response: stray.register(other.body.options) } })
    expect(unnamed.status).toBe(400)
    expect(JSON.stringify(unnamed.body)).toContain('Give the passkey a name.')
    expect((await api('/api/me/passkeys', {})).status).toBe(401)
  })

  it('a passkey signature is stored with its assertion and what it signed; the record shows the key', async () => {
    const record = (await api(`/api/worksheets/${released}`, { cookie: cookies.engineer })).body
    expect(record.state).toBe('released')
    const [performer, inspector] = record.signatures
    expect(performer).toMatchObject({ capacity: 'performer', method: 'passkey' })
    expect(inspector).toMatchObject({ capacity: 'inspector', method: 'passkey', name: 'Imke Dorsey' })
    const [row] = await sql<{ assertion: unknown, payload: unknown }>(fileDatabase(), 'SELECT assertion, payload FROM signatures WHERE worksheet_id = ? AND capacity = ?', [released, 'performer'])
    expect(JSON.parse(asText(row!.assertion))).toHaveProperty('authenticatorData')
    expect(JSON.parse(asText(row!.payload))).toMatchObject({ format: 'chargewell-signature/1', worksheetId: released, capacity: 'performer' })
  })

  it('the exported PDF verifies on its own: both signatures valid, by whom, with which key, the print matching', async () => {
    const pdf = await recordPdf(released)
    const report = await verifyRecordPdf(pdf)
    expect(report.problems).toEqual([])
    expect(report.printed.mismatches).toEqual([])
    expect(report.ok).toBe(true)
    expect(report.operator).toBe('Fellmoor Regional')
    expect(report.station).toBe('Harlow Moor')
    expect(report.signatures.map(signature => [signature.capacity, signature.status, signature.key?.name])).toEqual([
      ['performer', 'valid', 'Security key, blue'],
      ['inspector', 'valid', 'Tablet 3, hangar B'],
    ])
    expect(report.signatures[0]!.signedContentHash).toBe(report.contentHash)
    // The records office's page: number and page x of y on every page, times with their zone, the hash.
    const folder = mkdtempSync(join(tmpdir(), 'chargewell-verify-'))
    writeFileSync(join(folder, 'record.pdf'), pdf)
    const { stdout: text } = await run('pdftotext', ['-layout', join(folder, 'record.pdf'), '-'])
    const pages = text.split('\f').filter(page => page.trim())
    // QX-FMB is based at Harlow Moor: the record names its station, and its operator.
    pages.forEach((page, index) => expect(page).toContain(`Worksheet ${released} · Fellmoor Regional · Harlow Moor · page ${index + 1} of ${pages.length}`))
    expect(text).toMatch(/\d{2}:\d{2} UTC/)
    expect(text).toContain(`Record content hash (SHA-256): ${report.contentHash}`)
    expect(text).toContain('Signed with a passkey, key')
    // The photo drawn in the record with its SHA-256 (signed with the rest: it is in the content), and the QR code.
    const sha256 = createHash('sha256').update(photo).digest('hex')
    expect(text.replace(/\s+/g, ' ')).toContain(`gauge-1420.png · SHA-256 ${sha256}`)
    const { stdout: images } = await run('pdfimages', ['-list', join(folder, 'record.pdf')])
    // The photo is the one image (it may carry its transparency as a second, "smask" entry); the QR code is
    // drawn as squares, and read here from the first page as a printer would put it on paper.
    expect(images.trim().split('\n').slice(2).filter(line => / image /.test(line))).toHaveLength(1)
    await run('pdftoppm', ['-r', '150', '-f', '1', '-l', '1', '-png', '-singlefile', join(folder, 'record.pdf'), join(folder, 'page')])
    const page = PNG.sync.read(readFileSync(join(folder, 'page.png')))
    const code = jsQR(new Uint8ClampedArray(page.data), page.width, page.height)
    expect(code?.data).toBe(`${baseURL()}/verify?worksheet=${released}&hash=${report.contentHash}`)
    expect(text).toContain('Verify this record: open')
  })

  it('the verify route checks a dropped PDF from the file alone, with no session', async () => {
    const pdf = await recordPdf(released)
    const answer = await fetch(`${baseURL()}/api/records/verify`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: Buffer.from(pdf) })
    const body = await answer.json()
    expect(answer.status, JSON.stringify(body)).toBe(200)
    expect(body).toMatchObject({ ok: true, worksheetId: released })
    const empty = await fetch(`${baseURL()}/api/records/verify`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: '' })
    expect(empty.status).toBe(422)
    const notPdf = await (await fetch(`${baseURL()}/api/records/verify`, { method: 'POST', headers: { 'content-type': 'application/pdf' }, body: 'hello' })).json()
    expect(notPdf).toMatchObject({ ok: false, readable: false, problems: ['This is not a PDF file.'] })
  })

  it('an edit of the released record in the database makes its PDF fail, naming the signature and the field', async () => {
    const [row] = await sql<{ content: unknown }>(fileDatabase(), 'SELECT content FROM worksheets WHERE id = ?', [released])
    const content = JSON.parse(asText(row!.content))
    const original = JSON.stringify(content)
    content.asFound.reading.value += 40
    await sql(fileDatabase(), 'UPDATE worksheets SET content = ? WHERE id = ?', [JSON.stringify(content), released])
    try {
      const report = await verifyRecordPdf(await recordPdf(released))
      expect(report.ok).toBe(false)
      for (const signature of report.signatures) {
        expect(signature.status).toBe('invalid')
        expect(signature.changedFields).toContain('content.asFound.reading.value')
        expect(signature.reasons.join(' ')).toContain('content.asFound.reading.value')
      }
    }
    finally {
      await sql(fileDatabase(), 'UPDATE worksheets SET content = ? WHERE id = ?', [original, released])
    }
  })

  it('the verify command: valid, tampered content, a foreign key, a truncated file', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'chargewell-fixtures-'))
    const valid = await recordPdf(released)
    const tampered = await withEmbeddedJson<{ worksheet: { content: { asLeft: { reading: { value: number } } } } }>(
      valid, 'chargewell-record.json', (record) => { record.worksheet.content.asLeft.reading.value -= 25 })
    const foreign = new SoftwareAuthenticator(baseURL())
    const foreignKey = await withEmbeddedJson<EmbeddedSignatures>(valid, 'chargewell-signatures.json', (signed) => {
      // Another authenticator's public key put in place of the inspector's.
      signed.signatures[1]!.key!.publicKey = foreign.publicKey
    })
    const fixtures = { valid, tampered, foreignKey, truncated: valid.slice(0, Math.floor(valid.length * 0.6)) }
    const results: Record<string, { code: number, out: string }> = {}
    for (const [name, bytes] of Object.entries(fixtures)) {
      writeFileSync(join(folder, `${name}.pdf`), bytes)
      try {
        const { stdout } = await run('npx', ['tsx', 'scripts/verify-record.ts', join(folder, `${name}.pdf`)], { cwd: process.cwd() })
        results[name] = { code: 0, out: stdout }
      }
      catch (error) {
        const failed = error as { code: number, stdout: string }
        results[name] = { code: failed.code, out: failed.stdout }
      }
    }
    expect(results.valid!.code, results.valid!.out).toBe(0)
    expect(results.valid!.out).toContain('VERIFIED')
    expect(results.valid!.out).toMatch(/- VALID: Performed by .*\n {2}method: passkey; key [0-9a-f ]{19} “Security key, blue”/)
    // Only the canonical copy edited: the file no longer agrees with itself, and says where.
    const canonicalOnly = await verifyRecordPdf(await withEmbeddedJson<{ canonicalContent: { workOrder: string } }>(
      valid, 'chargewell-record.json', (record) => { record.canonicalContent.workOrder = 'WO-FORGED' }))
    expect(canonicalOnly.ok).toBe(false)
    expect(canonicalOnly.problems.join(' ')).toMatch(/embedded canonical content differs from the printed record in workOrder/)
    expect(results.tampered!.code).toBe(1)
    expect(results.tampered!.out).toMatch(/- INVALID: Performed by[\s\S]*content\.asLeft\.reading\.value/)
    expect(results.foreignKey!.code).toBe(1)
    expect(results.foreignKey!.out).toMatch(/- INVALID: Inspected by Imke Dorsey[\s\S]*does not verify with key/)
    expect(results.truncated!.code).not.toBe(0)
    expect(results.truncated!.out).toMatch(/truncated/)
    // The embedded signatures carry each signer's key with its registration time.
    const signed = await readEmbeddedJson<EmbeddedSignatures>(valid, 'chargewell-signatures.json')
    expect(signed.signatures[0]!.key).toMatchObject({ name: 'Security key, blue', revokedAt: null })
  })

  it('a key revoked after signing still verifies the earlier record and cannot sign again', async () => {
    const [key] = (await api('/api/me/passkeys', { cookie: cookies.technician })).body
    const revoked = await api(`/api/me/passkeys/${key.id}/revoke`, { method: 'POST', cookie: cookies.technician })
    expect(revoked.status).toBe(200)
    expect(revoked.body.revokedAt).not.toBeNull()
    // Someone else's key cannot be revoked by this user.
    const [inspectorKey] = (await api('/api/me/passkeys', { cookie: cookies.inspector })).body
    expect((await api(`/api/me/passkeys/${inspectorKey.id}/revoke`, { method: 'POST', cookie: cookies.technician })).status).toBe(404)
    // An administrator revokes a key under its holder only.
    const technicianId = (await api('/api/me', { cookie: cookies.technician })).body.id
    const wrongHolder = `/api/admin/users/${technicianId}/passkeys/${inspectorKey.id}/revoke`
    expect((await api(wrongHolder, { method: 'POST', cookie: cookies.admin })).status).toBe(404)

    const report = await verifyRecordPdf(await recordPdf(released))
    expect(report.ok).toBe(true)
    expect(report.signatures[0]).toMatchObject({ status: 'valid', key: { name: 'Security key, blue' } })
    expect(report.signatures[0]!.key!.revokedAt).not.toBeNull()

    const next = await readyToSign('QX-FMB', /Main hydraulic/)
    // With no key left, the form is offered no passkey.
    expect((await api(`/api/worksheets/${next}/signing-options?capacity=performer`, { cookie: cookies.technician })).body.passkey).toBeNull()
    const revokedKey = keys.technician!
    keys.technician = await register('technician', 'Replacement key')
    const refused = await signWith(revokedKey, 'technician', next)
    expect(refused.status).toBe(401)
    expect(refused.body.message).toMatch(/revoked; it cannot sign/)
    expect((await api(`/api/worksheets/${next}`, { cookie: cookies.technician })).body.state).not.toBe('awaiting-countersign')
    expect((await signWith(keys.technician, 'technician', next)).status).toBe(200)
  })

  it('a passkey answer over other content is refused: the challenge is the content', async () => {
    const id = await readyToSign('QX-FMB', /Emergency brake/)
    const options = await api(`/api/worksheets/${id}/signing-options?capacity=performer`, { cookie: cookies.technician })
    const assertion = keys.technician!.assert(options.body.passkey.challenge)
    // The worksheet changes after the passkey signed.
    await api(`/api/worksheets/${id}`, { method: 'PATCH', cookie: cookies.technician, body: { step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Changed after the tap.' } })
    const refused = await api(`/api/worksheets/${id}/sign`, { cookie: cookies.technician, body: { certify: true, passkey: assertion } })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/changed after the passkey was asked to sign/)
    // The inspector's key is not the technician's.
    const options2 = await api(`/api/worksheets/${id}/signing-options?capacity=performer`, { cookie: cookies.technician })
    const wrongPerson = await api(`/api/worksheets/${id}/sign`, { cookie: cookies.technician, body: { certify: true, passkey: keys.inspector!.assert(options2.body.passkey.challenge) } })
    expect(wrongPerson.status).toBe(401)
    expect(wrongPerson.body.message).toMatch(/not registered to you/)
  })
})

describe('the organisation chooses how each role signs', () => {
  it('administrators only; audited; a password is refused where a passkey is required, naming the field', async () => {
    expect((await api('/api/admin/signing-policy', { method: 'PUT', cookie: cookies.technician, body: { performer: 'password', inspector: 'password' } })).status).toBe(403)
    const bad = await api('/api/admin/signing-policy', { method: 'PUT', cookie: cookies.admin, body: { performer: 'retina', inspector: 'either' } })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(bad.body)).toContain('performer')
    const set = await api('/api/admin/signing-policy', { method: 'PUT', cookie: cookies.admin, body: { performer: 'passkey', inspector: 'password' } })
    expect(set.status).toBe(200)
    expect(set.body).toMatchObject({ performer: 'passkey', inspector: 'password' })
    try {
      const id = await readyToSign('QX-FMC', /Main hydraulic/)
      const byPassword = await api(`/api/worksheets/${id}/sign`, { cookie: cookies.technician, body: { certify: true, password: DEMO_PASSWORD } })
      expect(byPassword.status).toBe(422)
      expect(byPassword.body.data.field).toBe('passkey')
      const options = await api(`/api/worksheets/${id}/signing-options?capacity=performer`, { cookie: cookies.technician })
      expect(options.body.rule).toBe('passkey')
      expect((await signWith(keys.technician!, 'technician', id)).status).toBe(200)
      // Inspectors sign with the password only: a passkey is refused, the password is taken.
      const inspectorOptions = await api(`/api/worksheets/${id}/signing-options?capacity=inspector`, { cookie: cookies.inspector })
      expect(inspectorOptions.body).toMatchObject({ rule: 'password', passkey: null })
      const byPasskey = await api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: { certify: true, passkey: keys.inspector!.assert(inspectorOptions.body.contentHash) } })
      expect(byPasskey.status).toBe(422)
      expect(byPasskey.body.data.field).toBe('password')
      const byInspectorPassword = await api(`/api/worksheets/${id}/countersign`, { cookie: cookies.inspector, body: { certify: true, password: DEMO_PASSWORD } })
      expect(byInspectorPassword.status).toBe(200)
      // A password signature is reported honestly: not provable from the file.
      const report = await verifyRecordPdf(await recordPdf(id))
      expect(report.signatures.map(signature => signature.status)).toEqual(['valid', 'password'])
      expect(report.signatures[1]!.reasons.join(' ')).toMatch(/Made with a password/)
    }
    finally {
      await api('/api/admin/signing-policy', { method: 'PUT', cookie: cookies.admin, body: { performer: 'either', inspector: 'either' } })
    }
    const trail = await sql<{ action: string }>(fileDatabase(), 'SELECT action FROM audit_events WHERE entity = ? ORDER BY id', ['setting'])
    expect(trail.map(row => row.action)).toEqual(['signing-policy-changed', 'signing-policy-changed'])
  })
})
