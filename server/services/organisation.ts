import { Op } from 'sequelize'
import type { OperatorBody, StationBody, UserScopeBody } from '#shared/schemas/organisation'
import type { OperatorDto, StationDto } from '#shared/types/organisation'
import { appendAudit } from '../database/audit-chain'
import { Aircraft, Operator, Station, User } from '../models'
import { notFound, unprocessable } from './audited-writes'
import { toOperatorDto, toStationDto } from './scope'

/** The organisation's stations and operators, and which of them each user may see (administrators only; audited). */

export async function listStations(): Promise<(StationDto & { aircraft: number })[]> {
  const [stations, counts] = await Promise.all([
    Station.findAll({ order: [['name', 'ASC']] }),
    Aircraft.count({ group: ['base'] }) as unknown as Promise<{ base: string, count: number }[]>,
  ])
  const countOf = new Map(counts.map(row => [row.base, Number(row.count)]))
  return stations.map(station => ({ ...toStationDto(station), aircraft: countOf.get(station.name) ?? 0 }))
}

export async function listOperators(): Promise<(OperatorDto & { aircraft: number })[]> {
  const [operators, counts, own] = await Promise.all([
    Operator.findAll({ order: [['own', 'DESC'], ['name', 'ASC']] }),
    Aircraft.count({ group: ['operatorId'] }) as unknown as Promise<{ operatorId: number | null, count: number }[]>,
    Operator.findOne({ where: { own: true }, attributes: ['id'] }),
  ])
  const countOf = new Map<number, number>()
  for (const row of counts) {
    const id = row.operatorId ?? own?.id
    if (id) countOf.set(id, (countOf.get(id) ?? 0) + Number(row.count))
  }
  return operators.map(operator => ({ ...toOperatorDto(operator), aircraft: countOf.get(operator.id) ?? 0 }))
}

const STATION_CONFLICT = 'Another station already has that name or code.'
const OPERATOR_CONFLICT = 'Another operator already has that name or code.'

function stationColumns(body: Partial<StationBody>) {
  return {
    ...(body.name !== undefined ? { name: body.name } : {}),
    ...(body.code !== undefined ? { code: body.code } : {}),
    ...(body.timeZone !== undefined ? { timeZone: body.timeZone } : {}),
    ...(body.elevation !== undefined
      ? { elevationValue: body.elevation.value, elevationUnit: body.elevation.unit }
      : {}),
  }
}

export function createStation(admin: User, body: StationBody): Promise<StationDto> {
  return uniqueOr409(() => writeTransaction(async (transaction) => {
    const station = await Station.create({
      name: body.name,
      code: body.code,
      timeZone: body.timeZone,
      elevationValue: body.elevation.value,
      elevationUnit: body.elevation.unit,
    }, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'station', entityId: String(station.id), action: 'created', detail: body }, transaction)
    return toStationDto(station)
  }), STATION_CONFLICT)
}

export function updateStation(admin: User, id: number, body: Partial<StationBody>): Promise<StationDto> {
  return uniqueOr409(() => writeTransaction(async (transaction) => {
    const station = await Station.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!station) notFound('Station')
    const from = toStationDto(station)
    await station.update(stationColumns(body), { transaction })
    await appendAudit({ actorId: admin.id, entity: 'station', entityId: String(id), action: 'updated', detail: { from, to: toStationDto(station) } }, transaction)
    return toStationDto(station)
  }), STATION_CONFLICT)
}

export function createOperator(admin: User, body: OperatorBody): Promise<OperatorDto> {
  return uniqueOr409(() => writeTransaction(async (transaction) => {
    const operator = await Operator.create({ name: body.name, code: body.code }, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'operator', entityId: String(operator.id), action: 'created', detail: body }, transaction)
    return toOperatorDto(operator)
  }), OPERATOR_CONFLICT)
}

export function updateOperator(admin: User, id: number, body: Partial<OperatorBody>): Promise<OperatorDto> {
  return uniqueOr409(() => writeTransaction(async (transaction) => {
    const operator = await Operator.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!operator) notFound('Operator')
    const from = toOperatorDto(operator)
    await operator.update(body, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'operator', entityId: String(id), action: 'updated', detail: { from, to: toOperatorDto(operator) } }, transaction)
    return toOperatorDto(operator)
  }), OPERATOR_CONFLICT)
}

/** Grants a user stations and operators (null: every one). Their next request sees the change. */
export async function setUserScope(admin: User, id: number, body: UserScopeBody): Promise<User> {
  const [stations, operators] = await Promise.all([
    body.stationIds ? Station.count({ where: { id: body.stationIds } }) : 0,
    body.operatorIds ? Operator.count({ where: { id: body.operatorIds } }) : 0,
  ])
  if (body.stationIds && stations !== body.stationIds.length) unprocessable('A granted station is not in the register.', 'stationIds')
  if (body.operatorIds && operators !== body.operatorIds.length) unprocessable('A granted operator is not in the register.', 'operatorIds')
  return writeTransaction(async (transaction) => {
    const user = await User.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!user) notFound('User')
    const from = { stationIds: user.stationIds ?? null, operatorIds: user.operatorIds ?? null }
    await user.update({ stationIds: body.stationIds, operatorIds: body.operatorIds }, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'user', entityId: String(id), action: 'scope-changed', detail: { from, to: body } }, transaction)
    sessionsChangedAfterCommit(user.id, transaction)
    return user
  })
}

/** The station an aircraft names as its base, which must be in the register (422 on `base` otherwise). */
export async function requireStation(name: string, field = 'base'): Promise<Station> {
  const station = await Station.findOne({ where: { name } })
  return station ?? unprocessable(`No station is named “${name}”: an administrator adds it under Admin → Stations first.`, field)
}

/** The operator an aircraft names (by name or code); the organisation's own fleet when none is named. */
export async function requireOperator(named: string | undefined, field = 'operator'): Promise<Operator> {
  const operator = named
    ? await Operator.findOne({ where: { [Op.or]: [{ name: named }, { code: named.toUpperCase() }] } })
    : await Operator.findOne({ where: { own: true }, order: [['id', 'ASC']] })
  return operator ?? unprocessable(named ? `No operator is named “${named}”.` : 'No operator is registered as the organisation\'s own fleet.', field)
}
