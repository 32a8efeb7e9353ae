import { readdirSync, statSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { rolesFor } from '../../shared/abilities'
import { ROLES } from '../../shared/types/user'
import { api, DEMO, signIn } from '../support/api'
import { routeOfFile } from '../../scripts/openapi-routes'
import { ROUTE_ACCESS } from './route-access'

const apiFolder = resolve(import.meta.dirname, '../../server/api')

function routeFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name)
    return statSync(path).isDirectory() ? routeFiles(path) : [path]
  })
}

/** `calc/charge-target.post.ts` → `POST /api/calc/charge-target` (as the OpenAPI route table reads it). */
function routeKey(file: string): string {
  const { method, route } = routeOfFile(file)
  return `${method} ${route}`
}

const roleAccount = {
  technician: DEMO.technician,
  inspector: DEMO.inspector,
  engineer: DEMO.engineer,
  admin: DEMO.admin,
} as const

describe('every route is in the role table', () => {
  const keys = routeFiles(apiFolder).map(routeKey)

  it('lists every file under server/api', () => {
    const missing = keys.filter(key => !(key in ROUTE_ACCESS))
    expect(missing, `Add these routes to tests/api/route-access.ts: ${missing.join(', ')}`).toEqual([])
  })

  it('lists no route that does not exist', () => {
    expect(Object.keys(ROUTE_ACCESS).filter(key => !keys.includes(key))).toEqual([])
  })
})

describe.each(Object.entries(ROUTE_ACCESS).flatMap(([key, access]) => access === 'public' ? [] : [[key, access] as const]))('%s', (key, access) => {
  const [method, pattern] = key.split(' ') as [string, string]
  // Not a session of anyone's: the check must not end the test's own sessions.
  const path = pattern.replace(/\[\w+\]/g, pattern.startsWith('/api/me/sessions/') ? '999999' : '1')
  const body = method === 'GET' ? undefined : {}

  it('answers 401 without a session', async () => {
    const answer = await api(path, { method, body })
    expect(answer.status).toBe(401)
    expect(answer.body.message).toMatch(/sign in/i)
  })

  // The roles that hold the route's ability, read from the one abilities table.
  const allowed = rolesFor(access, ROLES)
  for (const role of ROLES) {
    if (allowed.includes(role)) {
      it(`lets a ${role} through the role check`, async () => {
        const answer = await api(path, { method, body, cookie: await signIn(roleAccount[role]) })
        expect([401, 403]).not.toContain(answer.status)
        expect(answer.status).toBeLessThan(500)
      })
    }
    else {
      it(`refuses a ${role} with 403, before looking at the body`, async () => {
        const answer = await api(path, { method, body, cookie: await signIn(roleAccount[role]) })
        expect(answer.status).toBe(403)
      })
    }
  }
})
