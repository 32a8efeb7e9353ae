/**
 * The per-address sign-in limit, in a file of its own: its server starts with no failures counted, so
 * the test makes every one of the 30 itself and depends on no other test.
 */
import { describe, expect, it } from 'vitest'
import { api, DEMO, DEMO_PASSWORD } from '../support/api'
import { statusCounts } from '../support/counting'

const login = (email: string, password: string) => api('/api/auth/login', { body: { email, password } })

describe('the sign-in limit per network address', () => {
  it('stops an address after 30 failures across accounts, even for a right password', async () => {
    // 30 accounts that do not exist, one guess each: under every account's own limit of five.
    const spread = await Promise.all(
      Array.from({ length: 30 }, (_, index) => login(`spread-${index}@chargewell.test`, 'guess')),
    )
    expect(statusCounts(spread)).toEqual({ 401: 30 })
    const right = await login(DEMO.technician, DEMO_PASSWORD)
    expect(right.status).toBe(429)
    expect(right.body.message).toMatch(/from this network address/)
  })
})
