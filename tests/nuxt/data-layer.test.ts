import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import { defineComponent, h, reactive } from 'vue'
import { useMySessions } from '~~/composables/useAccount'
import { useOutbox } from '~~/composables/useAudit'
import { useUnit } from '~~/composables/useUnits'
import { useUsers } from '~~/composables/useUsers'
import { decideWorksheet, useWorksheet, useWorksheetList, type WorksheetFilters } from '~~/composables/useWorksheets'
import { errorMessage, isConflict } from '~~/utils/api-errors'
import { fakeServer, refusal, until } from './fake-server'

/**
 * The browser's data layer (composables/use{Worksheets,Units,Tools,Users,Account,Audit}.ts) in the Nuxt
 * runtime: what each sends (the version a decision was taken on, a cursor that belongs to its filters) and
 * that a change is read back from the server, never patched into the page from what was sent.
 */

let server: ReturnType<typeof fakeServer>
beforeEach(() => {
  server = fakeServer()
  setActivePinia(createPinia())
})

/** Runs a composable inside a mounted component (as a page does) and hands back what it returned. */
async function inPage<T>(composable: () => T | Promise<T>): Promise<Awaited<T>> {
  let answer: Awaited<T> | undefined
  await mountSuspended(defineComponent({
    async setup() {
      answer = await composable()
      return () => h('div')
    },
  }))
  return answer!
}

const gets = (url: string) => server.sent.filter(request => request.method === 'GET' && request.url === url)

describe('the worksheet register', () => {
  it('follows the cursor the server hands out, and a changed filter starts again from the first page', async () => {
    server.on('GET /api/worksheets', request => request.query.cursor
      ? { items: [], total: 60, previous: 'c0' }
      : { items: [], total: 60, next: 'c25' })
    const filters = reactive<WorksheetFilters>({})
    const list = await inPage(() => useWorksheetList(filters))
    expect(gets('/api/worksheets')[0]!.query).toMatchObject({ sort: 'createdAt', direction: 'desc', pageSize: 25 })
    expect(gets('/api/worksheets')[0]!.query.cursor).toBeUndefined()

    list.turn('next')
    await until(() => expect(gets('/api/worksheets')).toHaveLength(2))
    expect(gets('/api/worksheets')[1]!.query.cursor).toBe('c25')
    expect(list.pageNumber.value).toBe(2)

    // A cursor belongs to the filters it was handed out for: with a new filter it would skip rows.
    filters.state = 'draft'
    await until(() => expect(gets('/api/worksheets').at(-1)!.query).toMatchObject({ state: 'draft' }))
    expect(gets('/api/worksheets').at(-1)!.query.cursor).toBeUndefined()
    expect(list.pageNumber.value).toBe(1)
    expect(list.exportHref.value).toBe('/api/worksheets/export?state=draft&sort=createdAt&direction=desc')
  })
})

describe('a decision on a worksheet', () => {
  it('is sent with the version on screen, so a record changed since is refused, not acted on', async () => {
    server.on('POST /api/worksheets/7/void', () => {
      throw refusal(409, 'Worksheet 7 changed since you loaded it.')
    })
    const failure = await decideWorksheet({ id: 7, version: 4 }, 'void', { reason: 'Wrong aircraft' })
      .catch((error: unknown) => error)
    expect(server.sent[0]).toMatchObject({
      url: '/api/worksheets/7/void',
      method: 'POST',
      body: { reason: 'Wrong aircraft' },
      headers: { 'if-match': '"4"' },
    })
    expect(isConflict(failure)).toBe(true)
  })
})

describe('changes read back from the server', () => {
  it('a unit moved to stores is shown as the server now holds it', async () => {
    const stored = {
      current: { id: 12, partNumber: 'FA-2240-01', position: 'Normal brake, nose bay', aircraft: { registration: 'QX-FMA' } },
    } as { current: Record<string, unknown> }
    server.on('GET /api/accumulators/12', () => stored.current)
    server.on('PATCH /api/accumulators/12', (request) => {
      stored.current = { ...stored.current, aircraft: null, position: null }
      return { body: request.body }
    })
    const unit = await inPage(() => useUnit(12))
    expect(unit.data.value?.aircraft?.registration).toBe('QX-FMA')
    await unit.move({ aircraftId: null, date: '2026-12-04', reason: 'Removed for overhaul' })
    expect(server.sent.find(request => request.method === 'PATCH')!.body).toEqual({
      move: { aircraftId: null, date: '2026-12-04', reason: 'Removed for overhaul' },
    })
    expect(gets('/api/accumulators/12')).toHaveLength(2)
    expect(unit.data.value?.aircraft).toBeNull()
  })

  it('a refused change leaves the page as the server holds it, and says why', async () => {
    server.on('GET /api/admin/users', () => [{ id: 3, name: 'Ines Okafor', roles: ['technician'], disabled: false }])
    server.on('PATCH /api/admin/users/3', () => {
      throw refusal(422, 'The last administrator cannot lose the role.')
    })
    const users = await inPage(() => useUsers())
    const failure = await users.update(users.data.value![0]!, { roles: [] }).catch((error: unknown) => error)
    expect(errorMessage(failure)).toBe('The last administrator cannot lose the role.')
    expect(users.data.value![0]!.roles).toEqual(['technician'])
    expect(gets('/api/admin/users')).toHaveLength(1)
  })

  it('ending another session re-reads the list; a retried message re-reads the outbox', async () => {
    let sessions = [{ id: 1, current: true }, { id: 2, current: false }]
    server.on('GET /api/me/sessions', () => sessions)
    server.on('DELETE /api/me/sessions/2', () => {
      sessions = sessions.filter(session => session.id !== 2)
      return { ended: true }
    })
    const mine = await inPage(() => useMySessions())
    await mine.end({ id: 2 })
    expect(mine.data.value!.map(session => session.id)).toEqual([1])

    let status = 'failed'
    server.on('GET /api/admin/outbox', () => ({ notifications: [{ id: 5, status }] }))
    server.on('POST /api/admin/outbox/5/retry', () => {
      status = 'pending'
      return {}
    })
    const outbox = await inPage(() => useOutbox())
    await outbox.retry(5)
    expect(outbox.data.value!.notifications[0]!.status).toBe('pending')
  })
})

describe('with no signal', () => {
  it('a decision fails with words a mechanic can act on, not the browser’s fetch text', async () => {
    server.network.up = false
    const failure = await decideWorksheet({ id: 7, version: 4 }, 'sign', { password: 'x' })
      .catch((error: unknown) => error)
    expect(errorMessage(failure)).toMatch(/^No connection to Chargewell\./)
    expect(errorMessage(failure)).not.toMatch(/fetch/i)
  })
})

describe('a worksheet read again', () => {
  it('never goes back to an older version than the one on screen (a read answered after a step’s save)', async () => {
    let stored = { id: 9, version: 3, state: 'draft' }
    server.on('GET /api/worksheets/9', () => stored)
    const worksheet = await inPage(() => useWorksheet(9))
    // A step saved since: the page shows the server's answer, version 4.
    worksheet.data.value = { ...stored, version: 4 } as unknown as typeof worksheet.data.value
    await worksheet.reload()
    expect(worksheet.data.value!.version).toBe(4)
    stored = { ...stored, version: 5 }
    await worksheet.reload()
    expect(worksheet.data.value!.version).toBe(5)
    server.network.up = false
    await worksheet.reload()
    expect(worksheet.data.value!.version).toBe(5)
  })
})
