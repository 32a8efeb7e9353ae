import { Op, literal, type WhereOptions } from 'sequelize'
import type { OperatorDto, ScopeDto, StationDto } from '#shared/types/organisation'
import { Accumulator, AccumulatorInstallation, Aircraft, Operator, Station, type User } from '../models'
import { notFound } from './audited-writes'

/**
 * The one scope rule. A user sees the aircraft based at the stations they are granted, owned by the
 * operators they are granted (no grant: every station, every operator; administrators see the whole
 * organisation, since they grant the rest), and everything that hangs off those aircraft: units
 * installed on them, worksheets and their PDFs and photos, cycle checks, trends, alerts, the due list,
 * exports and the device's station copy. A unit in the stores is seen by whoever sees an aircraft it
 * was installed on (or by everyone, if it never was). Services take the scope and apply it here;
 * nothing is left to a page.
 *
 * Out of scope reads as not found (404), so a record's existence is not given away either.
 */
export interface Scope {
  whole: boolean
  /** The aircraft the user may see; null: every aircraft. */
  aircraftIds: number[] | null
  /** The station names granted; null: every station. */
  stations: string[] | null
  /** The operator ids granted; null: every operator. */
  operatorIds: number[] | null
}

export const WHOLE_ORGANISATION: Scope = { whole: true, aircraftIds: null, stations: null, operatorIds: null }

/** The organisation's own operator (aircraft without an operator belong to it). */
export async function ownOperatorId(): Promise<number | null> {
  return (await Operator.findOne({ where: { own: true }, order: [['id', 'ASC']], attributes: ['id'] }))?.id ?? null
}

export async function scopeOf(user: Pick<User, 'roles' | 'stationIds' | 'operatorIds'>): Promise<Scope> {
  const stationIds = user.roles.includes('admin') ? null : (user.stationIds ?? null)
  const operatorIds = user.roles.includes('admin') ? null : (user.operatorIds ?? null)
  if (stationIds === null && operatorIds === null) return WHOLE_ORGANISATION
  const stations = stationIds === null
    ? null
    : (await Station.findAll({ where: { id: stationIds }, attributes: ['name'] })).map(station => station.name)
  const own = await ownOperatorId()
  const operatorWhere = operatorIds === null
    ? {}
    : operatorIds.includes(own ?? -1)
      ? { [Op.or]: [{ operatorId: operatorIds }, { operatorId: null }] }
      : { operatorId: operatorIds }
  const visible = await Aircraft.findAll({
    where: { ...(stations === null ? {} : { base: stations }), ...operatorWhere },
    attributes: ['id'],
    raw: true,
  })
  return { whole: false, aircraftIds: visible.map(row => row.id), stations, operatorIds }
}

/** Whether the scope covers an aircraft. */
export function seesAircraft(scope: Scope, aircraftId: number | null | undefined): boolean {
  return scope.aircraftIds === null || (aircraftId != null && scope.aircraftIds.includes(aircraftId))
}

/** 404 (as if it were not there) unless the scope covers the aircraft. */
export function requireAircraftInScope(scope: Scope, aircraftId: number | null | undefined, what: string): void {
  if (!seesAircraft(scope, aircraftId)) notFound(what)
}

/** A where clause narrowed to the scope by its aircraft column (`aircraftId`, or `$aircraft.id$` through a join). */
export function withinScope(scope: Scope, where: WhereOptions = {}, column = 'aircraftId'): WhereOptions {
  if (scope.aircraftIds === null) return where
  return { [Op.and]: [where, { [column]: scope.aircraftIds }] }
}

/** Units the scope covers: installed on an aircraft it covers, or in the stores after one (or never installed). */
export function unitsWithinScope(scope: Scope, where: WhereOptions = {}, table = 'Accumulator'): WhereOptions {
  if (scope.aircraftIds === null) return where
  const ids = scope.aircraftIds.length > 0 ? scope.aircraftIds.join(',') : 'NULL'
  const column = (name: string) => `"${table}"."${name}"`
  return {
    [Op.and]: [
      where,
      literal(
        `(${column('aircraft_id')} IN (${ids}) OR (${column('aircraft_id')} IS NULL AND (`
        + `NOT EXISTS (SELECT 1 FROM accumulator_installations i WHERE i.accumulator_id = ${column('id')}) `
        + `OR EXISTS (SELECT 1 FROM accumulator_installations i WHERE i.accumulator_id = ${column('id')} `
        + `AND i.aircraft_id IN (${ids})))))`,
      ),
    ],
  }
}

/** The trend alerts about units and systems the scope covers (`precharge:<unit>`, `cycle:<aircraft>:<system>`). */
export async function alertsWithinScope<T extends { subject: string }>(scope: Scope, alerts: T[]): Promise<T[]> {
  if (scope.aircraftIds === null) return alerts
  const unitIds = alerts.flatMap(alert => (alert.subject.startsWith('precharge:') ? [Number(alert.subject.split(':')[1])] : []))
  const units = unitIds.length
    ? await Accumulator.findAll({ where: unitsWithinScope(scope, { id: unitIds }), attributes: ['id'], raw: true })
    : []
  const seenUnits = new Set(units.map(unit => unit.id))
  return alerts.filter((alert) => {
    const [kind, id] = alert.subject.split(':')
    return kind === 'precharge' ? seenUnits.has(Number(id)) : seesAircraft(scope, Number(id))
  })
}

/** Whether the scope covers one unit (see unitsWithinScope). */
export async function seesUnit(scope: Scope, unit: { id: number, aircraftId: number | null }): Promise<boolean> {
  if (scope.aircraftIds === null) return true
  if (unit.aircraftId != null) return scope.aircraftIds.includes(unit.aircraftId)
  const aircraftIds = (await AccumulatorInstallation.findAll({ where: { accumulatorId: unit.id }, attributes: ['aircraftId'], raw: true }))
    .map(row => row.aircraftId)
  return aircraftIds.length === 0 || aircraftIds.some(id => scope.aircraftIds!.includes(id))
}

export function toStationDto(station: Station): StationDto {
  return {
    id: station.id,
    name: station.name,
    code: station.code,
    timeZone: station.timeZone,
    elevation: { value: station.elevationValue, unit: station.elevationUnit },
  }
}

export function toOperatorDto(operator: Operator): OperatorDto {
  return { id: operator.id, name: operator.name, code: operator.code, own: operator.own }
}

/** What the user may see, by name, for the pages to say ("You see Skelby · Corran Isles Airways"). */
export async function scopeDto(user: Pick<User, 'roles' | 'stationIds' | 'operatorIds'>): Promise<ScopeDto> {
  const scope = await scopeOf(user)
  const [stations, operators] = await Promise.all([
    Station.findAll({ where: scope.stations === null ? {} : { name: scope.stations }, order: [['name', 'ASC']] }),
    Operator.findAll({ where: scope.operatorIds === null ? {} : { id: scope.operatorIds }, order: [['name', 'ASC']] }),
  ])
  return {
    whole: scope.whole,
    stations: stations.map(toStationDto),
    operators: operators.map(toOperatorDto),
    everyStation: scope.stations === null,
    everyOperator: scope.operatorIds === null,
  }
}

/** The station an aircraft is based at (its time zone dates its records), if registered. */
export async function stationNamed(name: string | null | undefined): Promise<StationDto | null> {
  if (!name) return null
  const station = await Station.findOne({ where: { name } })
  return station ? toStationDto(station) : null
}
