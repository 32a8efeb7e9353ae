/**
 * A gauge photo can be replaced or removed while the worksheet is being filled — by its
 * performer only — and never once the worksheet is signed; each change is in the audit trail.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, signIn, upload } from '../support/api'
import { baseURL } from '../support/file-server'
import { fillWorksheet, finishAndSign, unitAt } from '../support/worksheet-flow'

const cookies = {} as Record<keyof typeof DEMO, string>
// The smallest valid PNG signature and header are enough for recognition by content.
const png = (marker: number) =>
  new Uint8Array([
    0x89,
    0x50,
    0x4e,
    0x47,
    0x0d,
    0x0a,
    0x1a,
    0x0a,
    0,
    0,
    0,
    13,
    0x49,
    0x48,
    0x44,
    0x52,
    0,
    0,
    0,
    1,
    0,
    0,
    0,
    1,
    8,
    2,
    0,
    0,
    0,
    marker,
  ])

beforeAll(async () => {
  for (const [name, email] of Object.entries(DEMO)) cookies[name as keyof typeof DEMO] = await signIn(email)
})

describe('replacing and removing a photo', () => {
  it('replaces a photo (the new bytes are served), removes one, and refuses both once signed', async () => {
    const unit = await unitAt(cookies.technician, 'QX-FMJ', /Normal brake/)
    const flow = await fillWorksheet(cookies.technician, unit.id)
    const fields = { worksheetId: String(flow.id), kind: 'gauge-photo' }
    const first = await upload('/api/attachments', fields, { name: 'blurred.png', bytes: png(1) }, cookies.technician)
    expect(first.status).toBe(201)
    const replaced = await upload(
      '/api/attachments',
      { ...fields, replacesId: String(first.body.id) },
      { name: 'sharp.png', bytes: png(2) },
      cookies.technician,
    )
    expect(replaced.status).toBe(201)
    let worksheet = (await api(`/api/worksheets/${flow.id}`, { cookie: cookies.technician })).body
    expect(worksheet.attachments.map((attachment: { originalName: string }) => attachment.originalName)).toEqual([
      'sharp.png',
    ])
    const served = new Uint8Array(
      await (
        await fetch(`${baseURL()}/api/attachments/${replaced.body.id}`, { headers: { cookie: cookies.engineer! } })
      ).arrayBuffer(),
    )
    expect(served.at(-1)).toBe(2)
    expect((await api(`/api/attachments/${first.body.id}`, { cookie: cookies.engineer })).status).toBe(404)
    // Not an attachment of this worksheet: refused on the field.
    expect(
      (
        await upload(
          '/api/attachments',
          { ...fields, replacesId: '999999' },
          { name: 'x.png', bytes: png(3) },
          cookies.technician,
        )
      ).status,
    ).toBe(404)

    const extra = await upload(
      '/api/attachments',
      { ...fields, kind: 'certificate' },
      { name: 'extra.png', bytes: png(4) },
      cookies.technician,
    )
    expect((await api(`/api/attachments/${extra.body.id}`, { method: 'DELETE', cookie: cookies.lead })).status).toBe(
      403,
    )
    const removed = await api(`/api/attachments/${extra.body.id}`, { method: 'DELETE', cookie: cookies.technician })
    expect(removed.status).toBe(200)
    expect(removed.body.attachments).toHaveLength(1)

    expect((await finishAndSign(cookies.technician, flow)).status).toBe(200)
    expect(
      (await api(`/api/attachments/${replaced.body.id}`, { method: 'DELETE', cookie: cookies.technician })).status,
    ).toBe(409)
    expect(
      (
        await upload(
          '/api/attachments',
          { ...fields, replacesId: String(replaced.body.id) },
          { name: 'late.png', bytes: png(5) },
          cookies.technician,
        )
      ).status,
    ).toBe(409)
    worksheet = (await api(`/api/worksheets/${flow.id}`, { cookie: cookies.technician })).body
    expect(worksheet.attachments).toHaveLength(1)
    const verify = await api('/api/audit/verify', { cookie: cookies.admin })
    expect(verify.body.ok).toBe(true)
  })
})

describe('a photo\'s name as the tablet gives it', () => {
  it('keeps a name with "=" and ";" whole when the page sends it as a field (the multipart header cannot)', async () => {
    const unit = await unitAt(cookies.technician, 'QX-FMJ', /System 2/)
    const flow = await fillWorksheet(cookies.technician, unit.id)
    const name = 'gauge=GA-0141; as-left.png'
    const answer = await upload('/api/attachments', { worksheetId: String(flow.id), kind: 'gauge-photo', fileName: name }, { name, bytes: png(7), type: 'image/png' }, cookies.technician)
    expect(answer.status).toBe(201)
    expect(answer.body.originalName).toBe(name)
    const empty = await upload('/api/attachments', { worksheetId: String(flow.id), kind: 'gauge-photo', fileName: ' ' }, { name, bytes: png(8), type: 'image/png' }, cookies.technician)
    expect(empty.status).toBe(400)
    expect(JSON.stringify(empty.body)).toMatch(/fileName/)
  })
})
