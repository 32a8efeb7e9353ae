/**
 * The served description: /api/openapi.json answers without a session, describes every route of the running
 * server, and each calculation example in it, sent as it stands to the route it documents, is answered 200
 * (by a session and by an API token with the calculations scope).
 */
import { describe, expect, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'

interface Operation {
  requestBody?: { content: Record<string, { example?: unknown }> }
  security?: Record<string, string[]>[]
}

describe('GET /api/openapi.json', () => {
  it('is open, and its calculation examples are answered 200 by the routes they document', async () => {
    const answer = await api('/api/openapi.json')
    expect(answer.status).toBe(200)
    expect(answer.body.openapi).toBe('3.1.0')
    const paths = answer.body.paths as Record<string, Record<string, Operation>>
    expect(Object.keys(paths)).toContain('/api/worksheets/{id}/countersign')
    expect(Object.keys(paths)).toContain('/api/admin/webhooks/deliveries/{id}/replay')

    const technician = await signIn(DEMO.technician)
    const token = await api('/api/me/tokens', { cookie: technician, body: { name: 'OpenAPI examples', scopes: ['calculations'], expiresInDays: 1 } })
    expect(token.status).toBe(201)
    const calculations = Object.entries(paths).filter(([path]) => path.startsWith('/api/calc/'))
    expect(calculations.length).toBe(12)
    for (const [path, operations] of calculations) {
      const example = operations.post!.requestBody!.content['application/json']!.example
      expect(example, path).toBeDefined()
      const bySession = await api(path, { cookie: technician, body: example })
      expect(bySession.status, `${path}: ${JSON.stringify(bySession.body)}`).toBe(200)
      const byToken = await api(path, { body: example, headers: { authorization: `Bearer ${token.body.token}` } })
      expect(byToken.status, `${path} by token: ${JSON.stringify(byToken.body)}`).toBe(200)
    }
  })

  it('refuses a query it does not take, naming it', async () => {
    const answer = await api('/api/openapi.json?format=yaml')
    expect(answer.status).toBe(400)
    expect(JSON.stringify(answer.body)).toContain('format')
  })
})
