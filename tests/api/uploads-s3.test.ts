/**
 * Attachments in an S3-compatible bucket (for several servers without a shared disk), against
 * s3rver, a local fake of S3 started here: the photo goes into the bucket and comes back whole.
 */
import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import S3rver from 's3rver'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO, DEMO_PASSWORD } from '../support/api'
import { freePort } from '../support/ports'
import { startTestServer, type TestServer } from '../support/test-server'

const BUCKET = 'chargewell-uploads'
let bucketFolder: string
let fakeS3: S3rver
let server: TestServer

beforeAll(async () => {
  bucketFolder = mkdtempSync(join(tmpdir(), 'chargewell-s3-'))
  const port = await freePort()
  fakeS3 = new S3rver({
    address: '127.0.0.1',
    port,
    silent: true,
    directory: bucketFolder,
    configureBuckets: [{ name: BUCKET, configs: [] }],
  })
  await fakeS3.run()
  server = await startTestServer({
    NUXT_UPLOADS_S3_BUCKET: BUCKET,
    NUXT_UPLOADS_S3_ENDPOINT: `http://127.0.0.1:${port}`,
    NUXT_UPLOADS_S3_REGION: 'us-east-1',
    // s3rver's fixed credentials.
    NUXT_UPLOADS_S3_ACCESS_KEY_ID: 'S3RVER',
    NUXT_UPLOADS_S3_SECRET_ACCESS_KEY: 'S3RVER',
  })
}, 60_000)

afterAll(async () => {
  await server?.dispose()
  await fakeS3?.close()
  rmSync(bucketFolder, { recursive: true, force: true })
})

describe('attachments in an S3-compatible bucket', () => {
  it('stores a gauge photo in the bucket and serves it back whole', async () => {
    const login = await fetch(`${server.baseURL}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: DEMO.technician, password: DEMO_PASSWORD }),
    })
    const cookie = login.headers
      .getSetCookie()
      .map(line => line.split(';')[0])
      .join('; ')
    const draft = (
      await (await fetch(`${server.baseURL}/api/worksheets?state=draft&pageSize=1`, { headers: { cookie } })).json()
    ).items[0]
    const png = new Uint8Array([
      0x89,
      0x50,
      0x4e,
      0x47,
      0x0d,
      0x0a,
      0x1a,
      0x0a,
      ...Array.from({ length: 200 }, (_, index) => index % 256),
    ])
    const form = new FormData()
    form.append('worksheetId', String(draft.id))
    form.append('kind', 'gauge-photo')
    form.append('file', new Blob([png], { type: 'image/png' }), 'gauge.png')
    const stored = await fetch(`${server.baseURL}/api/attachments`, { method: 'POST', body: form, headers: { cookie } })
    expect(stored.status, await stored.clone().text()).toBe(201)
    const { id } = await stored.json()
    const served = await fetch(`${server.baseURL}/api/attachments/${id}`, { headers: { cookie } })
    expect(served.status).toBe(200)
    expect(new Uint8Array(await served.arrayBuffer())).toEqual(png)
    const inBucket = readdirSync(join(bucketFolder, BUCKET), { recursive: true }).map(String)
    expect(inBucket.some(name => name.startsWith(String(draft.id)))).toBe(true)
  })
})
