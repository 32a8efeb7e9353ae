/**
 * On PostgreSQL each server keeps exactly one LISTEN connection for session news. Every connection
 * of the database is cut ten times under write load (what a `pg_ctl restart` does to a server):
 * the LISTEN connections stay flat at one per server, and no acknowledged write is lost. (Before,
 * a drop fired both `error` and `end`, each reconnecting: 2 → 6 → 18 → 54 … until "too many clients".)
 */
import { describe, expect, inject, it } from 'vitest'
import { api, DEMO, signIn } from '../support/api'
import { sql } from '../support/database'
import { fileDatabase } from '../support/file-server'
import { isPostgresUrl } from '../support/postgres'

const onPostgres = isPostgresUrl(inject('templateDatabase'))
const listening = async () => Number((await sql<{ count: string }>(fileDatabase(),
  'SELECT count(*) AS count FROM pg_stat_activity WHERE datname = current_database() AND query ILIKE \'LISTEN%\''))[0]!.count)

describe.skipIf(!onPostgres)('the database cut off ten times under load', () => {
  it('keeps one LISTEN connection and every acknowledged write', { timeout: 180_000 }, async () => {
    const technician = await signIn(DEMO.technician)
    const units = (await api('/api/accumulators?installed=true&pageSize=50', { cookie: technician })).body.items as { id: number }[]
    await expect.poll(listening, { timeout: 20_000 }).toBe(1)
    const acknowledged: number[] = []
    let running = true
    const writer = (async () => {
      for (let index = 0; running; index++) {
        const answer = await api('/api/worksheets', { cookie: technician, body: { accumulatorId: units[index % units.length]!.id, workOrder: `WO-PGCUT-${index}`, reason: 'scheduled' } }).catch(() => null)
        if (answer?.status === 201) acknowledged.push(answer.body.id)
      }
    })()
    const counts: number[] = []
    for (let round = 0; round < 10; round++) {
      await sql(fileDatabase(), 'SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid()')
      await expect.poll(listening, { timeout: 40_000 }).toBe(1)
      counts.push(await listening())
    }
    running = false
    await writer
    expect(counts).toEqual(Array.from({ length: 10 }, () => 1))
    expect(acknowledged.length).toBeGreaterThan(10)
    const admin = await signIn(DEMO.admin)
    for (const id of acknowledged) expect((await api(`/api/worksheets/${id}`, { cookie: admin })).status, `worksheet ${id}`).toBe(200)
  })
})
