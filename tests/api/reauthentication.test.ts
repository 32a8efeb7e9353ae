/**
 * Re-authentication (the password re-entered to countersign, or to change one's own password) is
 * counted like a sign-in: a stolen live session cannot guess its way past the sign-in lockout. The
 * limits are the demo's configuration: 5 failures per account in 15 minutes.
 */
import { describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD, signIn } from '../support/api'
import { sql } from '../support/database'
import { fileDatabase } from '../support/file-server'

async function freshSession(email: string): Promise<string> {
  const response = await api('/api/auth/login', { body: { email, password: DEMO_PASSWORD } })
  expect(response.status).toBe(200)
  return response.headers.getSetCookie().map(line => line.split(';')[0]).join('; ')
}

describe('wrong passwords on a live session', () => {
  it('100 wrong countersign passwords: 4 are answered 401, then the account locks, the session ends, and the right one is refused', async () => {
    const inspector = await freshSession(DEMO.inspector)
    const [row] = await sql<{ id: number }>(fileDatabase(), 'SELECT id FROM worksheets WHERE state = ? ORDER BY id LIMIT 1', ['awaiting-countersign'])
    const countersign = (password: string) =>
      api(`/api/worksheets/${row!.id}/countersign`, { cookie: inspector, body: { password, certify: true } })
    const statuses: number[] = []
    for (let guess = 0; guess < 100; guess++) {
      const answer = await countersign(`guess-${guess}`)
      statuses.push(answer.status)
      if (answer.status === 429) expect(answer.body.message).toMatch(/session has been ended/)
      if (answer.status !== 401) break
    }
    expect(statuses).toEqual([401, 401, 401, 401, 429])
    // The right password on the same session: the session is gone.
    expect((await countersign(DEMO_PASSWORD)).status).toBe(401)
    expect((await api(`/api/worksheets/${row!.id}`, { cookie: await signIn(DEMO.admin) })).body.state).toBe('awaiting-countersign')
    // And a new sign-in waits out the lock like any other.
    expect((await api('/api/auth/login', { body: { email: DEMO.inspector, password: DEMO_PASSWORD } })).status).toBe(429)
  })

  it('30 wrong current passwords sent at once to the password change: at most 5 are checked, the rest locked out', async () => {
    const engineer = await freshSession(DEMO.engineer)
    const answers = await Promise.all(Array.from({ length: 30 }, (_, guess) =>
      api('/api/me/password', { cookie: engineer, body: { currentPassword: `wrong-${guess}`, newPassword: 'a-new-long-password-1' } })))
    const statuses = answers.map(answer => answer.status)
    expect(statuses.filter(status => status === 422).length).toBeLessThanOrEqual(5)
    expect(statuses.filter(status => status === 200)).toEqual([])
    expect(statuses.every(status => [422, 429, 401].includes(status))).toBe(true)
    expect((await api('/api/me', { cookie: engineer })).status).toBe(401)
  })
})
