/**
 * Sign-in that holds under parallel guessing, per account and per network address, with the
 * same work for unknown accounts; and bodies that are too large, or carry numbers JSON should
 * not, refused before they cost anything.
 */
import { request } from 'node:http'
import { beforeAll, describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { statusCounts } from '../support/counting'
import { baseURL } from '../support/file-server'
import { fillWorksheet, toolId, unitAt } from '../support/worksheet-flow'

const login = (email: string, password: string) => api('/api/auth/login', { body: { email, password } })

// Sessions for the later tests are made first, before any guessing from this address.
beforeAll(async () => {
  for (const email of [DEMO.admin, DEMO.inspector, DEMO.technician]) await signIn(email)
})

describe('the sign-in lockout under parallel guessing', () => {
  it('150 guesses at once check 5 passwords; the right one, sent with them, is refused with 429', async () => {
    const guesses = Array.from({ length: 149 }, (_, index) => login(DEMO.engineer, `wrong-guess-${index}`))
    const answers = await Promise.all([...guesses, login(DEMO.engineer, DEMO_PASSWORD)])
    expect(statusCounts(answers)).toEqual({ 401: 5, 429: 145 })
    const right = answers.at(-1)!
    expect(right.status).toBe(429)
    expect(right.body.message).toMatch(/Too many failed sign-ins for this account/)
    expect(Number(right.headers.get('retry-after'))).toBeGreaterThan(800)
    expect((await login(DEMO.engineer, DEMO_PASSWORD)).status).toBe(429)
  })

  it('an unknown account costs the same work as a known one (a dummy hash)', async () => {
    const time = async (email: string) => {
      const started = performance.now()
      await login(email, 'not-the-password-1')
      return performance.now() - started
    }
    // The least of each: the work itself, without the waits a busy machine adds to some requests.
    const least = (values: number[]) => Math.min(...values)
    const known: number[] = []
    const unknown: number[] = []
    // Four of each: under the account limit of five.
    for (let index = 0; index < 4; index++) {
      known.push(await time(DEMO.admin))
      unknown.push(await time(`nobody-${index}@chargewell.test`))
    }
    const ratio = least(unknown) / least(known)
    expect(ratio, `unknown ${least(unknown).toFixed(1)} ms, known ${least(known).toFixed(1)} ms`).toBeGreaterThan(0.5)
    expect(ratio).toBeLessThan(2)
  })
})

function rawPost(
  path: string,
  headers: Record<string, string>,
  write: (body: NodeJS.WritableStream) => void,
): Promise<{ status: number, text: string }> {
  return new Promise((done, fail) => {
    const url = new URL(path, baseURL())
    const outgoing = request(
      { host: url.hostname, port: url.port, path: url.pathname, method: 'POST', headers },
      (incoming) => {
        let text = ''
        incoming.on('data', (chunk) => {
          text += chunk
        })
        incoming.on('end', () => {
          done({ status: incoming.statusCode ?? 0, text })
          // A body the server refused unread is never finished by the caller: the request ends here.
          outgoing.destroy()
        })
      },
    )
    outgoing.on('error', fail)
    write(outgoing)
  })
}

describe('body limits and numbers JSON should not carry', () => {
  it('refuses an anonymous 50 MB sign-in body with 413, unread', async () => {
    // Ten bytes of the declared 50 MB are sent and the body is never finished: only a server that answers on the
    // declared length alone answers at all (one that read the body would wait until the test's time-out).
    const answer = await rawPost(
      '/api/auth/login',
      { 'content-type': 'application/json', 'content-length': String(50 * 1024 * 1024) },
      body => body.write('{"email":"'),
    )
    expect(answer.status).toBe(413)
  })

  it('refuses a body nested 2,000 deep (4 KB) before anything parses or walks it', async () => {
    const nested = `{"email":${'['.repeat(2000)}${']'.repeat(2000)},"password":"x"}`
    const answer = await api('/api/auth/login', { raw: nested })
    expect(answer.status).toBe(400)
    expect(answer.body.message).toMatch(/nested more than 32 levels/)
    // Brackets inside strings are text, not nesting.
    const text = await api('/api/auth/login', { body: { email: '[[[['.repeat(20), password: '{{{{'.repeat(20) } })
    expect(text.body.message).not.toMatch(/nested/)
  })

  it('refuses a chunked body over the limit as it arrives', async () => {
    const answer = await rawPost(
      '/api/calc/charge-target',
      { 'content-type': 'application/json', 'transfer-encoding': 'chunked', 'cookie': await signIn(DEMO.inspector) },
      (body) => {
        const chunk = 'x'.repeat(64 * 1024)
        for (let index = 0; index < 8; index++) body.write(chunk)
        body.end()
      },
    )
    expect(answer.status).toBe(413)
    expect(JSON.parse(answer.text).message).toMatch(/larger than this route accepts/)
  })

  it('refuses 1e999 as a gauge range with 400 naming the field, and a 999,999 psi as-found', async () => {
    const admin = await signIn(DEMO.admin)
    const tools = (await api('/api/tools?kind=gauge', { cookie: admin })).body.items as {
      id: number
      assetNumber: string
    }[]
    const gauge = tools.find(tool => tool.assetNumber === 'GA-0141')!
    const infinite = await api(`/api/tools/${gauge.id}`, { method: 'PATCH', cookie: admin, raw: '{"rangeMax":1e999}' })
    expect(infinite.status).toBe(400)
    expect(infinite.body.data.issues).toEqual([
      expect.objectContaining({ field: 'rangeMax', message: 'Must be an ordinary finite number.' }),
    ])
    const removed = await api(`/api/tools/${gauge.id}`, { method: 'PATCH', cookie: admin, body: { rangeMax: null } })
    expect(removed.status).toBe(400)
    expect(removed.body.message).toMatch(/A gauge needs its range/)

    const technician = await signIn(DEMO.technician)
    const unit = await unitAt(technician, 'QX-FMJ', /System 1/)
    const flow = await fillWorksheet(technician, unit.id)
    const huge = await api(`/api/worksheets/${flow.id}`, {
      method: 'PATCH',
      cookie: technician,
      body: { step: 'asFound', reading: { value: 999_999, unit: 'psi', basis: 'gauge' } },
    })
    expect(huge.status).toBe(422)
    expect(huge.body.data.field).toBe('reading.value')
    expect(await toolId(technician, 'GA-0141')).toBe(gauge.id)
  })

  it('refuses page numbers that would overflow, on every list', async () => {
    const cookie = await signIn(DEMO.admin)
    for (const path of [
      '/api/worksheets',
      '/api/aircraft',
      '/api/accumulators',
      '/api/specifications',
      '/api/tools',
      '/api/cycle-checks',
      '/api/studies',
    ]) {
      const answer = await api(`${path}?page=1e20`, { cookie })
      expect(answer.status, path).toBe(400)
      expect(answer.body.data.issues[0].field).toBe('page')
    }
  })

  it('answers a missing or bad worksheetId or kind on the upload form with 400 naming the field', async () => {
    const cookie = await signIn(DEMO.technician)
    for (const fields of [{}, { worksheetId: 'abc', kind: 'gauge-photo' }, { worksheetId: '1', kind: 'selfie' }]) {
      const form = new FormData()
      for (const [name, value] of Object.entries(fields)) form.append(name, value)
      form.append('file', new Blob([new Uint8Array([0xff, 0xd8, 0xff, 0xe0])]), 'gauge.jpg')
      const response = await fetch(`${baseURL()}/api/attachments`, { method: 'POST', body: form, headers: { cookie } })
      expect(response.status).toBe(400)
      const body = await response.json()
      expect(body.data.issues.map((issue: { field: string }) => issue.field).join(',')).toMatch(/worksheetId|kind/)
    }
  })
})
