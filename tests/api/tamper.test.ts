/**
 * Someone with the database file but not the server's secret edits it behind Chargewell's back.
 * Verification recomputes every record's content hash, the chain's links and its sealed head,
 * and names what no longer matches. The signed export checks offline with Node alone.
 */
import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { auditHash } from '../../server/database/audit-chain'
import { api, DEMO, signIn } from '../support/api'
import { asText, sql } from '../support/database'
import { baseURL, fileDatabase } from '../support/file-server'

const root = resolve(import.meta.dirname, '../..')
const checker = join(root, 'scripts/check-audit-export.mjs')
let admin: string
beforeAll(async () => {
  admin = await signIn(DEMO.admin)
})

const verify = async () => (await api('/api/audit/verify', { cookie: admin })).body

/** Edits a row in the file, checks that verification names it, then puts the row back as it was. */
async function tamperWith(table: string, column: string, id: number, change: (value: unknown) => unknown) {
  const path = fileDatabase()
  const [before] = await sql<Record<string, unknown>>(path, `SELECT ${column} AS value FROM ${table} WHERE id = ?`, [
    id,
  ])
  await sql(path, `UPDATE ${table} SET ${column} = ? WHERE id = ?`, [change(before!.value), id])
  const report = await verify()
  await sql(path, `UPDATE ${table} SET ${column} = ? WHERE id = ?`, [before!.value, id])
  return report
}

async function releasedWorksheet(): Promise<number> {
  const [row] = await sql<{ id: number }>(
    fileDatabase(),
    'SELECT id FROM worksheets WHERE state = \'released\' ORDER BY id LIMIT 1 OFFSET 7',
  )
  return row!.id
}

describe('editing the database file is caught', () => {
  it('starts intact: every record vouched for, the head sealed', async () => {
    const report = await verify()
    expect(report).toMatchObject({
      ok: true,
      mismatches: 0,
      headProblems: [],
      head: { sealed: true, sealChecked: true },
    })
    expect(report.recordsChecked).toBeGreaterThan(150)
    expect(report.signingKey.fingerprint).toMatch(/^([0-9a-f]{4}:){7}[0-9a-f]{4}$/)
  })

  it('a released worksheet\'s results', async () => {
    const id = await releasedWorksheet()
    const report = await tamperWith('worksheets', 'results', id, value =>
      asText(value)
        .replace(/"verdict":"[a-z-]+"/, '"verdict":"in-limits"')
        .replace(/"difference":(-?[\d.]+)/, '"difference":0'),
    )
    expect(report.ok).toBe(false)
    expect(report.firstMismatch).toMatchObject({ entity: 'worksheet', entityId: String(id) })
    expect(report.firstMismatch.reason).toMatch(/changed outside Chargewell/)
    expect((await verify()).ok).toBe(true)
  })

  it('a reading in a released worksheet\'s content', async () => {
    const id = await releasedWorksheet()
    const report = await tamperWith('worksheets', 'content', id, value =>
      asText(value).replace(
        /"asFound": ?\{"reading": ?\{"value": ?(\d+)/,
        (_, reading) => `"asFound":{"reading":{"value":${Number(reading) + 50}`,
      ),
    )
    expect(report.firstMismatch).toMatchObject({ entity: 'worksheet', entityId: String(id) })
  })

  it('the serviceable flag', async () => {
    const id = await releasedWorksheet()
    const report = await tamperWith('worksheets', 'serviceable', id, value => !value)
    expect(report.firstMismatch).toMatchObject({ entity: 'worksheet', entityId: String(id) })
  })

  it('an inspector signature\'s name, naming the worksheet it belongs to', async () => {
    const id = await releasedWorksheet()
    const [signature] = await sql<{ id: number }>(
      fileDatabase(),
      'SELECT id FROM signatures WHERE worksheet_id = ? AND capacity = \'inspector\'',
      [id],
    )
    const report = await tamperWith('signatures', 'name', signature!.id, () => 'Somebody Else')
    expect(report.firstMismatch).toMatchObject({ entity: 'worksheet', entityId: String(id) })
  })

  it('a specification\'s reference pre-charge, and a user\'s roles', async () => {
    expect(
      (await tamperWith('specifications', 'reference_pressure', 1, value => Number(value) + 100)).firstMismatch,
    ).toMatchObject({ entity: 'specification', entityId: '1' })
    expect(
      (await tamperWith('users', 'roles', 1, () => '["technician","inspector","admin"]')).firstMismatch,
    ).toMatchObject({ entity: 'user', entityId: '1' })
  })

  it('a row inserted or deleted behind the application\'s back', async () => {
    const path = fileDatabase()
    const id = await releasedWorksheet()
    const [signature] = await sql<Record<string, unknown>>(
      path,
      'SELECT * FROM signatures WHERE worksheet_id = ? AND capacity = \'inspector\'',
      [id],
    )
    await sql(path, 'DELETE FROM signatures WHERE id = ?', [signature!.id])
    expect((await verify()).firstMismatch).toMatchObject({ entity: 'worksheet', entityId: String(id) })
    const columns = Object.keys(signature!)
    await sql(
      path,
      `INSERT INTO signatures (${columns.join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`,
      columns.map(column => signature![column]),
    )
    expect((await verify()).ok).toBe(true)
    await sql(
      path,
      'INSERT INTO tools (kind, asset_number, description, active, created_at, updated_at) VALUES (\'gauge\', \'GA-9999\', \'Smuggled in\', TRUE, \'2026-01-01\', \'2026-01-01\')',
    )
    const report = await verify()
    expect(report.firstMismatch.reason).toMatch(/no audit entry vouching for its content/)
    await sql(path, 'DELETE FROM tools WHERE asset_number = \'GA-9999\'')
    expect((await verify()).ok).toBe(true)
  })
})

describe('the signed export, checked offline', () => {
  it('downloads as signed NDJSON (admin only) and checks intact with the pinned key', async () => {
    const technician = await signIn(DEMO.technician)
    expect((await api('/api/audit/export', { cookie: technician })).status).toBe(403)
    const response = await fetch(`${baseURL()}/api/audit/export`, { headers: { cookie: admin } })
    expect(response.status).toBe(200)
    expect(response.headers.get('content-disposition')).toMatch(/chargewell-audit-\d{4}-\d{2}-\d{2}\.ndjson/)
    const text = await response.text()
    const folder = mkdtempSync(join(tmpdir(), 'chargewell-export-'))
    const file = join(folder, 'export.ndjson')
    writeFileSync(file, text)
    const { fingerprint } = (await verify()).signingKey
    const output = execFileSync(process.execPath, [checker, file, '--key', fingerprint], { encoding: 'utf8' })
    expect(output).toMatch(/^INTACT: \d+ entries/)

    // One changed character in one entry, or another key pinned: refused.
    const lines = text.trimEnd().split('\n')
    lines[5] = lines[5]!.replace(/"action":"([a-z-]+)"/, '"action":"$1x"')
    writeFileSync(join(folder, 'edited.ndjson'), `${lines.join('\n')}\n`)
    const edited = spawnSync(process.execPath, [checker, join(folder, 'edited.ndjson'), '--key', fingerprint], { encoding: 'utf8' })
    expect(edited.status).toBe(1)
    expect(edited.stderr).toMatch(/NOT INTACT[\s\S]*does not match its hash/)
    const otherKey = spawnSync(process.execPath, [checker, file, '--key', '0000:0000:0000:0000:0000:0000:0000:0000'], {
      encoding: 'utf8',
    })
    expect(otherKey.status).toBe(1)
    expect(otherKey.stderr).toMatch(/not the expected/)
    expect(readFileSync(file, 'utf8')).toBe(text)
    // No key pinned: it will not judge (anyone can re-sign a file with their own key) unless told to trust it.
    const unpinned = spawnSync(process.execPath, [checker, file], { encoding: 'utf8' })
    expect(unpinned.status).toBe(2)
    expect(unpinned.stderr).toMatch(/--key/)
    expect(execFileSync(process.execPath, [checker, file, '--trust-embedded-key'], { encoding: 'utf8' })).toMatch(/^INTACT \(checked against the key the file carries/)
    // The sealed head is signed: editing it breaks the signature.
    const headEdited = text.trimEnd().split('\n')
    headEdited[headEdited.length - 1] = headEdited.at(-1)!.replace(/"eventCount":(\d+)/, (_, count) => `"eventCount":${Number(count) + 1}`)
    writeFileSync(join(folder, 'head.ndjson'), `${headEdited.join('\n')}\n`)
    const head = spawnSync(process.execPath, [checker, join(folder, 'head.ndjson'), '--key', fingerprint], { encoding: 'utf8' })
    expect(head.status).toBe(1)
    expect(head.stderr).toMatch(/signature does not verify/)
    // A stray carriage return, or a file cut short: one plain line, no stack trace.
    writeFileSync(join(folder, 'cr.ndjson'), text.replace('"action"', '"act\rion"'))
    const stray = spawnSync(process.execPath, [checker, join(folder, 'cr.ndjson'), '--key', fingerprint], { encoding: 'utf8' })
    expect(stray.status).toBe(1)
    expect(stray.stderr.trim().split('\n')).toHaveLength(1)
    expect(stray.stderr).not.toMatch(/at .*\.mjs:\d+/)
    writeFileSync(join(folder, 'cut.ndjson'), text.slice(0, Math.floor(text.length / 2)))
    const cut = spawnSync(process.execPath, [checker, join(folder, 'cut.ndjson'), '--key', fingerprint], { encoding: 'utf8' })
    expect(cut.status).toBe(1)
    expect(cut.stderr.trim().split('\n')).toHaveLength(1)
  })
})

describe('a period\'s signed export', () => {
  const exportOf = async (query: string) => {
    const response = await fetch(`${baseURL()}/api/audit/export${query}`, { headers: { cookie: admin } })
    expect(response.status).toBe(200)
    return { text: await response.text(), name: response.headers.get('content-disposition') }
  }
  const check = (text: string, fingerprint: string) => {
    const file = join(mkdtempSync(join(tmpdir(), 'chargewell-period-')), 'period.ndjson')
    writeFileSync(file, text)
    return spawnSync(process.execPath, [checker, file, '--key', fingerprint], { encoding: 'utf8' })
  }
  const entriesOf = (text: string) => text.trimEnd().split('\n').slice(1, -1).map(line => JSON.parse(line))

  it('is the period\'s unbroken run of the chain, linked to its anchor and signed, checked offline', async () => {
    const { fingerprint } = (await verify()).signingKey
    const whole = entriesOf((await exportOf('')).text)
    const { text, name } = await exportOf('?from=2026-06-01&to=2026-08-31')
    expect(name).toContain('chargewell-audit-2026-06-01-to-2026-08-31.ndjson')
    const lines = text.trimEnd().split('\n')
    const header = JSON.parse(lines[0]!)
    expect(header).toMatchObject({ version: 3, period: { from: '2026-06-01', to: '2026-08-31', fromInstant: '2026-06-01T00:00:00.000Z', untilInstant: '2026-09-01T00:00:00.000Z' } })
    const entries = entriesOf(text)
    // Every entry dated in the period is there, and the run is the whole chain's entries from its first to its last.
    const dated = whole.filter(entry => entry.at >= '2026-06-01' && entry.at < '2026-09-01')
    expect(dated.length).toBeGreaterThan(5)
    expect(entries.map(entry => entry.id)).toEqual(expect.arrayContaining(dated.map(entry => entry.id)))
    const first = whole.findIndex(entry => entry.id === entries[0].id)
    expect(entries).toEqual(whole.slice(first, first + entries.length))
    // Anchored on the entry before the run: its hash is what the run's first entry links to.
    expect(header.anchor).toEqual(first === 0 ? { entryId: null, hash: '0'.repeat(64) } : { entryId: whole[first - 1].id, hash: whole[first - 1].hash })
    expect(entries[0].previousHash).toBe(header.anchor.hash)
    const checked = check(text, fingerprint)
    expect(checked.status, checked.stderr).toBe(0)
    expect(checked.stdout).toContain(`INTACT: ${entries.length} entries (${dated.length} dated in the period`)
    expect(checked.stdout).toContain(`of the period 2026-06-01 to 2026-08-31`)
    // Another anchor in the header: the run no longer links to it, and the signature (over the header too) fails.
    const moved = [JSON.stringify({ ...header, anchor: { entryId: 1, hash: 'f'.repeat(64) } }), ...lines.slice(1)].join('\n')
    const refused = check(`${moved}\n`, fingerprint)
    expect(refused.status).toBe(1)
    expect(refused.stderr).toMatch(/does not link to the entry before it[\s\S]*signature does not verify/)
    // An entry of the run left out: refused.
    const cut = [...lines.slice(0, 2), ...lines.slice(3)].join('\n')
    expect(check(`${cut}\n`, fingerprint).status).toBe(1)
  })

  it('an empty period is an empty signed run; a half-given or backwards period is named', async () => {
    const { fingerprint } = (await verify()).signingKey
    const { text } = await exportOf('?from=1990-01-01&to=1990-12-31')
    expect(JSON.parse(text.split('\n')[0]!).anchor).toEqual({ entryId: null, hash: '0'.repeat(64) })
    expect(entriesOf(text)).toEqual([])
    const checked = check(text, fingerprint)
    expect(checked.status, checked.stderr).toBe(0)
    expect(checked.stdout).toMatch(/^INTACT: 0 entries/)
    const half = await api('/api/audit/export?from=2026-01-01', { cookie: admin })
    expect(half.status).toBe(400)
    expect(JSON.stringify(half.body)).toMatch(/both the first and the last date/)
    const backwards = await api('/api/audit/export?from=2026-02-01&to=2026-01-01', { cookie: admin })
    expect(backwards.status).toBe(400)
    expect(backwards.body.data.issues[0].field).toBe('to')
  })
})

describe('cutting or rebuilding the chain is caught (the chain stays broken after these)', () => {
  it('deleting the newest audit entries', async () => {
    const path = fileDatabase()
    const [{ id }] = (await sql<{ id: number }>(path, 'SELECT MAX(id) AS id FROM audit_events')) as [{ id: number }]
    await sql(path, 'DELETE FROM audit_events WHERE id > ?', [id - 2])
    const report = await verify()
    expect(report.ok).toBe(false)
    expect(report.headProblems.join(' ')).toMatch(/counts \d+ entries but \d+ are present: entries were deleted/)
  })

  it('a chain rebuilt without the secret: an edited record re-hashed, a vouching entry appended, the head moved', async () => {
    const path = fileDatabase()
    const id = await releasedWorksheet()
    await sql(path, 'UPDATE worksheets SET serviceable = NOT serviceable WHERE id = ?', [id])
    // The forger has the file and the source code, so computes everything as the server would, but has no secret.
    const { openDatabase } = await import('../../server/database/connection')
    const { recordHash } = await import('../../server/database/record-hash')
    const { AuditEvent } = await import('../../server/models')
    const sequelize = await openDatabase(path)
    try {
      const hashOfRecord = await recordHash('worksheet', id)
      const last = (await AuditEvent.findOne({ order: [['id', 'DESC']] }))!
      const entry = {
        at: new Date(Math.floor(Date.now())),
        actorId: 2,
        entity: 'worksheet',
        entityId: String(id),
        action: 'corrected',
        detail: {},
      }
      const event = await AuditEvent.create({
        ...entry,
        recordHash: hashOfRecord,
        hashVersion: 2,
        previousHash: last.hash,
        hash: auditHash({ ...entry, recordHash: hashOfRecord }, last.hash, 2),
      })
      await sequelize.query('UPDATE audit_heads SET event_count = ?, last_event_id = ?, last_hash = ? WHERE id = 1', {
        replacements: [await AuditEvent.count(), event.id, event.hash],
      })
    }
    finally {
      await sequelize.close()
    }
    const report = await verify()
    // Links, hashes, count and the edited record all agree now; only the seal gives it away.
    // (The entry deleted in the test before vouched for one record, which is still reported.)
    expect(report.firstBroken).toBeUndefined()
    expect(
      report.records.filter(
        (problem: { entity: string, entityId: string }) =>
          problem.entity === 'worksheet' && problem.entityId === String(id),
      ),
    ).toEqual([])
    expect(report.ok).toBe(false)
    expect(report.headProblems).toEqual([expect.stringMatching(/seal does not match/)])
  })
})
