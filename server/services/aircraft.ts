import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { aircraftQuerySchema, aircraftSchema, aircraftUpdateSchema } from '#shared/schemas/aircraft'
import { aircraftCsvRow } from '#shared/schemas/csv'
import type { FleetOptions } from '#shared/types/fleet'
import { appendAudit } from '../database/audit-chain'
import { Accumulator, Aircraft, type User } from '../models'
import { createAudited, findOr404, updateAudited } from './audited-writes'

/** The fleet register: aircraft, their filters and their CSV. */

const CONFLICT = 'Another aircraft already has that registration or fleet number.'

export async function listAircraft(query: z.infer<typeof aircraftQuerySchema>) {
  const { total, totalCapped, rows } = await pageOf(Aircraft, {
    where: {
      ...searchWhere(query.q, ['registration', 'fleetNumber', 'type', 'base']),
      ...(query.type ? { type: query.type } : {}),
      ...(query.base ? { base: query.base } : {}),
      ...(query.active !== undefined ? { active: query.active } : {}),
    },
    order: [[query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, totalCapped, items: rows.map(row => row.get({ plain: true })) }
}

/** An aircraft with the accumulators installed on it. */
export async function aircraftById(id: number) {
  return (await findOr404(Aircraft, id, 'Aircraft', { include: [{ model: Accumulator, as: 'accumulators' }] })).get({ plain: true })
}

/** The types and bases the register holds, for filters: options come from the data, never from a page. */
export async function fleetOptions(): Promise<FleetOptions> {
  const distinct = async (column: 'type' | 'base') =>
    (await Aircraft.findAll({ attributes: [column], group: [column], order: [[column, 'ASC']], raw: true })).map(row => row[column])
  return { types: await distinct('type'), bases: await distinct('base') }
}

export async function createAircraft(actor: User, body: z.infer<typeof aircraftSchema>) {
  const created = await createAudited(Aircraft, body, { actor, entity: 'aircraft', action: 'created', detail: body, conflict: CONFLICT })
  return created.get({ plain: true })
}

export async function updateAircraft(actor: User, id: number, body: z.infer<typeof aircraftUpdateSchema>) {
  const aircraft = await findOr404(Aircraft, id, 'Aircraft')
  await updateAudited(aircraft, body, { actor, entity: 'aircraft', action: 'updated', detail: body, conflict: CONFLICT })
  return aircraft.get({ plain: true })
}

/** Aircraft from CSV (the export's columns): every row valid, or nothing imported. */
export function importAircraft(event: H3Event, actor: User) {
  return importCsv(event, aircraftCsvRow, async (row, transaction) => {
    const created = await Aircraft.create(row, { transaction })
    await appendAudit({ actorId: actor.id, entity: 'aircraft', entityId: String(created.id), action: 'imported', detail: row }, transaction)
  })
}
