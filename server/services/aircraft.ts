import type { H3Event } from 'h3'
import type { Model, ModelStatic } from 'sequelize'
import type { z } from 'zod'
import type { aircraftQuerySchema, aircraftSchema, aircraftUpdateSchema } from '#shared/schemas/aircraft'
import { aircraftCsvRow } from '#shared/schemas/csv'
import type { FleetOptions } from '#shared/types/fleet'
import { Accumulator, Aircraft, Operator, type User } from '../models'
import { createAudited, findOr404, updateAudited } from './audited-writes'
import { requireOperator, requireStation } from './organisation'
import { requireAircraftInScope, withinScope, type Scope } from './scope'

/** The fleet register: aircraft, their filters and their CSV. */

const CONFLICT = 'Another aircraft already has that registration or fleet number.'

/** The operator names by id, the organisation's own fleet for aircraft without one. */
export async function operatorNames(): Promise<(operatorId: number | null) => string> {
  const operators = await Operator.findAll({ attributes: ['id', 'name', 'own'] })
  const names = new Map(operators.map(operator => [operator.id, operator.name]))
  const own = operators.find(operator => operator.own)?.name ?? ''
  return operatorId => (operatorId === null ? own : names.get(operatorId) ?? own)
}

function withOperator(row: Aircraft, nameOf: (operatorId: number | null) => string) {
  return { ...row.get({ plain: true }), operator: nameOf(row.operatorId ?? null) }
}

export async function listAircraft(query: z.infer<typeof aircraftQuerySchema>, scope: Scope) {
  const { total, totalCapped, rows } = await pageOf(Aircraft, {
    where: withinScope(scope, {
      ...searchWhere(query.q, ['registration', 'fleetNumber', 'type', 'base']),
      ...(query.type ? { type: query.type } : {}),
      ...(query.base ? { base: query.base } : {}),
      ...(query.active !== undefined ? { active: query.active } : {}),
    }, 'id'),
    order: [[query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  const nameOf = await operatorNames()
  return { total, totalCapped, items: rows.map(row => withOperator(row, nameOf)) }
}

/** An aircraft with the accumulators installed on it (404 outside the user's scope). */
export async function aircraftById(id: number, scope: Scope) {
  requireAircraftInScope(scope, id, 'Aircraft')
  const aircraft = await findOr404(Aircraft, id, 'Aircraft', { include: [{ model: Accumulator, as: 'accumulators' }] })
  return withOperator(aircraft, await operatorNames())
}

/** The types and bases of the aircraft the user may see, for filters: options come from the data, never from a page. */
export async function fleetOptions(scope: Scope): Promise<FleetOptions> {
  const distinct = async (column: 'type' | 'base') =>
    (await Aircraft.findAll({ where: withinScope(scope, {}, 'id'), attributes: [column], group: [column], order: [[column, 'ASC']], raw: true }))
      .map(row => row[column])
  return { types: await distinct('type'), bases: await distinct('base') }
}

/** The columns an aircraft body sets: its base must be a registered station, its operator a registered operator. */
async function aircraftColumns(body: Partial<z.infer<typeof aircraftSchema>>, creating: boolean) {
  const { operator, ...columns } = body
  if (columns.base !== undefined) await requireStation(columns.base)
  const operatorId = operator !== undefined || creating ? (await requireOperator(operator)).id : undefined
  return { ...columns, ...(operatorId !== undefined ? { operatorId } : {}) }
}

export async function createAircraft(actor: User, body: z.infer<typeof aircraftSchema>) {
  const columns = await aircraftColumns(body, true) as z.infer<typeof aircraftSchema> & { operatorId: number }
  const created = await createAudited(Aircraft, columns, { actor, entity: 'aircraft', action: 'created', detail: body, conflict: CONFLICT })
  return withOperator(created, await operatorNames())
}

export async function updateAircraft(actor: User, id: number, body: z.infer<typeof aircraftUpdateSchema>) {
  const aircraft = await findOr404(Aircraft, id, 'Aircraft')
  const columns = await aircraftColumns(body, false)
  await updateAudited(aircraft, columns, { actor, entity: 'aircraft', action: 'updated', detail: body, conflict: CONFLICT })
  return withOperator(aircraft, await operatorNames())
}

/** Aircraft from CSV (the export's columns): every row valid, or nothing imported. */
export function importAircraft(event: H3Event, actor: User) {
  // By registration: a new aircraft is added, a known one takes the edited cells (its base, operator, type).
  return importCsv(event, aircraftCsvRow, async (row, transaction) => {
    const fields: Record<string, unknown> = await aircraftColumns(row, true)
    // An aircraft written before operators (no operator: the own fleet) named as the own fleet is no change.
    const known = await Aircraft.findOne({ where: { registration: row.registration }, transaction })
    const own = (await requireOperator(undefined)).id
    if (known && known.operatorId === null && fields.operatorId === own) delete fields.operatorId
    return upsertRow({
      model: Aircraft as ModelStatic<Model>,
      where: { registration: row.registration },
      fields,
      key: row.registration,
      entity: 'aircraft',
      actor,
      transaction,
    })
  })
}
