import { mailAlerts } from './notifications'
import { currentSpecification } from './specifications'
import { requireUnitInScope } from './accumulators'
import { requireAircraftInScope, withinScope, type Scope } from './scope'
import { Op, type Transaction } from 'sequelize'
import type { CycleTrendPage, CycleTrendRow, FleetTrendRow, UnitTrendDto } from '#shared/types/trends'
import { cycleTrend, downsample, type CycleTrend } from '#shared/utils/cycle-check'
import { specificationPressure } from '#shared/utils/specification-target'
import {
  refreshUnitTrend,
  removeReadings,
  renormaliseUnit,
  storeReleasedReadings,
  syncAlert,
  type AlertChange,
} from './unit-trends'
import {
  Accumulator,
  Aircraft,
  CycleCheck,
  PrechargeReading,
  Specification,
  SystemCycleTrend,
  UnitTrend,
  type Worksheet,
} from '../models'

/**
 * Fleet trends: kept up to date by the writes that change them (release, void, a specification
 * revision, a cycle check) and read from the stored results, so reading them costs nothing and
 * never writes. Alerts are raised or cleared in those writes and mailed once, after commit.
 */

/** A worksheet was just released: store its readings and refit its unit (inside the release's write). */
/** A released correction supersedes the record it corrects: that record's readings leave its unit's trend. */
export async function trendAfterCorrection(correction: Worksheet, transaction: Transaction): Promise<AlertChange[]> {
  if (!correction.correctsId) return []
  await removeReadings(correction.correctsId, transaction)
  const change = await refreshUnitTrend(correction.accumulatorId, transaction)
  return change ? [change] : []
}

export async function trendAfterRelease(worksheet: Worksheet, transaction: Transaction): Promise<AlertChange[]> {
  await storeReleasedReadings(worksheet, transaction)
  const change = await refreshUnitTrend(worksheet.accumulatorId, transaction)
  return change ? [change] : []
}

/** A released worksheet was voided: its readings no longer count. */
export async function trendAfterVoid(
  worksheet: Worksheet,
  previousState: string,
  transaction: Transaction,
): Promise<AlertChange[]> {
  if (previousState !== 'released') return []
  await removeReadings(worksheet.id, transaction)
  const change = await refreshUnitTrend(worksheet.accumulatorId, transaction)
  return change ? [change] : []
}

/** A specification of this part number changed: re-carry its units' readings, refit them, then mail. */
export async function trendAfterSpecificationChange(partNumber: string): Promise<void> {
  const specification = await currentSpecification(partNumber)
  const units = await Accumulator.findAll({ where: { partNumber }, attributes: ['id'] })
  for (const unit of units) {
    await renormaliseUnit(unit.id, specification, writeTransaction)
    await writeTransaction(async (transaction) => {
      const change = await refreshUnitTrend(unit.id, transaction)
      // Queued in the write that raised it: an alert is never raised without its mail.
      if (change) await mailAlerts([change])
    })
  }
}

/** A pump cycle check was recorded: its system's interval trend raises or clears its alert. */
export async function trendAfterCycleCheck(
  aircraftId: number,
  system: string,
  transaction: Transaction,
): Promise<AlertChange[]> {
  const [trend] = await cycleTrends({ aircraftId, system }, transaction)
  await storeCycleTrend({ aircraftId, system }, trend, transaction)
  // Every check withdrawn: nothing is left to flag.
  const change = await syncAlert(
    'cycle',
    `cycle:${aircraftId}:${system}`,
    trend?.flagged ?? false,
    `${trend?.registration ?? ''} ${system}: ${trend?.message ?? ''}`,
    transaction,
  )
  return change ? [change] : []
}

export interface FleetTrendFilters {
  type?: string
  base?: string
  position?: string
  partNumber?: string
  flagged?: boolean
  page?: number
  pageSize?: number
}

/**
 * Installed units ranked by loss rate (fastest loss first), from the stored trends, a page at a time:
 * the database sorts and pages (units without a trend last), so the cost is one page whatever the fleet.
 */
export async function fleetPrechargeTrends(
  filters: FleetTrendFilters,
  scope: Scope,
): Promise<{ items: FleetTrendRow[], total: number, page: number, pageSize: number }> {
  const page = filters.page ?? 1
  const pageSize = filters.pageSize ?? 50
  const where = withinScope(scope, {
    aircraftId: { [Op.ne]: null },
    ...(filters.partNumber ? { partNumber: filters.partNumber } : {}),
    ...(filters.position ? { position: { [likeOperator()]: `%${filters.position}%` } } : {}),
    ...(filters.type ? { '$aircraft.type$': filters.type } : {}),
    ...(filters.base ? { '$aircraft.base$': filters.base } : {}),
    ...(filters.flagged !== undefined ? { '$trend.flagged$': filters.flagged } : {}),
  })
  const include = [
    { model: Aircraft, as: 'aircraft', attributes: ['registration', 'type', 'base'] },
    { model: UnitTrend, as: 'trend', required: false },
  ]
  const [total, units] = await Promise.all([
    // The count joins only what the filters name (a count over every join of 19,000 units took 23 ms).
    Accumulator.count({ where, include: namesIncluded(where) ? include : undefined }),
    Accumulator.findAll({
      where,
      include,
      order: [[{ model: UnitTrend, as: 'trend' }, 'lossPerDay', 'DESC NULLS LAST'], ['id', 'ASC']],
      limit: pageSize,
      offset: (page - 1) * pageSize,
      subQuery: false,
    }),
  ])
  const partNumbers = [...new Set(units.map(unit => unit.partNumber))]
  const pressureUnits = new Map(
    (await Specification.findAll({
      where: { status: 'current', partNumber: partNumbers },
      attributes: ['partNumber', 'pressureUnit'],
    })).map(row => [row.partNumber, row.pressureUnit]),
  )
  const items = units.map((unit) => {
    const joined = unit as Accumulator & { aircraft?: Aircraft, trend?: UnitTrend }
    const trend = joined.trend
    return {
      accumulatorId: unit.id,
      registration: joined.aircraft?.registration ?? null,
      type: joined.aircraft?.type ?? null,
      base: joined.aircraft?.base ?? null,
      position: unit.position,
      partNumber: unit.partNumber,
      serialNumber: unit.serialNumber,
      unit: pressureUnits.has(unit.partNumber) ? `${pressureUnits.get(unit.partNumber)}/day` : null,
      lossRate: trend?.lossPerDay ?? null,
      lossRateStandardError: trend?.fit?.lossRateStandardError ?? null,
      predictedOutOfLimitsAt: trend?.fit?.predictedOutOfLimitsAt ?? null,
      nextCheckAt: trend?.flag.nextCheckAt ?? null,
      flagged: trend?.flagged ?? false,
      reasons: trend?.flag.reasons ?? [],
      services: trend?.services ?? 0,
    }
  })
  return { items, total, page, pageSize }
}

/** One unit's trend with its points and services, from the stored readings. */
export async function unitTrend(accumulatorId: number, scope: Scope): Promise<UnitTrendDto> {
  await requireUnitInScope(scope, accumulatorId)
  const accumulator = await Accumulator.findByPk(accumulatorId, {
    include: [
      { model: Aircraft, as: 'aircraft' },
      { model: UnitTrend, as: 'trend', required: false },
    ],
  })
  if (!accumulator) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Accumulator not found.' })
  const joined = accumulator as Accumulator & { aircraft?: Aircraft, trend?: UnitTrend }
  const specification = await currentSpecification(accumulator.partNumber)
  const readings = await PrechargeReading.findAll({
    where: { accumulatorId },
    order: [
      ['takenAt', 'ASC'],
      ['id', 'ASC'],
    ],
    include: [{ association: 'worksheet', attributes: ['id', 'performedAt'] }],
  })
  let segment = 0
  const usable = readings.filter(row => row.normalised !== null && row.specificationId === specification?.id)
  const normalised = usable.map((row, index) => {
    if (row.startsSegment && index > 0) segment++
    return { takenAt: row.takenAt.toISOString(), value: row.normalised!, segment }
  })
  const services = new Map<number, UnitTrendDto['services'][number]>()
  for (const row of readings) {
    const performedAt
      = (row as PrechargeReading & { worksheet?: Worksheet }).worksheet?.performedAt?.toISOString()
        ?? row.takenAt.toISOString()
    const service = services.get(row.worksheetId) ?? {
      worksheetId: row.worksheetId,
      performedAt,
      asFound: null,
      asLeft: null,
      action: row.action,
    }
    if (row.kind === 'as-found') service.asFound = row.normalised
    service.asLeft = row.normalised
    services.set(row.worksheetId, service)
  }
  const stored = joined.trend
  return {
    accumulator: {
      id: accumulator.id,
      partNumber: accumulator.partNumber,
      serialNumber: accumulator.serialNumber,
      position: accumulator.position,
    },
    aircraft: joined.aircraft
      ? {
          id: joined.aircraft.id,
          registration: joined.aircraft.registration,
          type: joined.aircraft.type,
          base: joined.aircraft.base,
        }
      : null,
    specification: specification
      ? {
          id: specification.id,
          partNumber: specification.partNumber,
          revision: specification.revision,
          pressureUnit: specification.pressureUnit,
          pressureBasis: specification.pressureBasis,
        }
      : null,
    trend:
      stored?.fit && specification
        ? {
            ...stored.fit,
            normalised,
            reference: {
              pressure: specificationPressure(specification, specification.referencePressure),
              temperature: { value: specification.referenceTemperature, unit: specification.referenceTemperatureUnit },
            },
          }
        : null,
    flag: stored?.flag ?? { flagged: false, reasons: [], nextCheckAt: null, lossPerDay: null },
    services: [...services.values()],
  }
}

/** Pump cycle interval trends per aircraft system, against each system's own baseline. */
export async function cycleTrends(
  only?: { aircraftId: number, system: string },
  transaction?: Transaction,
): Promise<CycleTrend[]> {
  const checks = await CycleCheck.findAll({
    // Withdrawn checks are kept, but say nothing about the system.
    where: { ...only, withdrawnAt: null },
    attributes: ['aircraftId', 'accumulatorId', 'system', 'checkedAt', 'intervalSeconds', 'results'],
    include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }],
    order: [['checkedAt', 'ASC']],
    transaction,
  })
  const groups = new Map<string, CycleCheck[]>()
  for (const check of checks) {
    const key = `${check.aircraftId}|${check.system}`
    const group = groups.get(key)
    if (group) group.push(check)
    else groups.set(key, [check])
  }
  const dropShare = Number(useRuntimeConfig().cycleDropShare)
  return [...groups.values()]
    .map((group) => {
      const first = group[0]! as CycleCheck & { aircraft?: Aircraft }
      return cycleTrend(
        {
          aircraftId: first.aircraftId,
          registration: first.aircraft?.registration ?? '',
          system: first.system,
          accumulatorId: group.at(-1)!.accumulatorId,
          checks: group.map(check => ({
            checkedAt: check.checkedAt.toISOString(),
            intervalSeconds: check.intervalSeconds,
            leakRate: (check.results as { leakRate: { value: number, unit: string } }).leakRate,
          })),
        },
        dropShare,
      )
    })
    .sort((a, b) => (b.drop ?? -1) - (a.drop ?? -1))
}

/** The table's order of a system: its drop, largest first; systems without one (too few checks) last. */
const rankOf = (drop: number | null) => drop ?? -1e9

/** A system's stored trend rewritten from its checks (removed when none is left), in the write that changed them. */
async function storeCycleTrend(
  key: { aircraftId: number, system: string },
  trend: CycleTrend | undefined,
  transaction?: Transaction,
): Promise<void> {
  if (!trend) {
    await SystemCycleTrend.destroy({ where: key, transaction })
    return
  }
  const latest = trend.checks.at(-1)
  await SystemCycleTrend.upsert({
    ...key,
    accumulatorId: trend.accumulatorId,
    registration: trend.registration,
    checks: trend.checks.length,
    baselineSeconds: trend.baselineSeconds,
    latestSeconds: trend.latestSeconds,
    latestLeakRate: latest?.leakRate ?? null,
    drop: trend.drop,
    rank: rankOf(trend.drop),
    flagged: trend.flagged,
    message: trend.message,
    firstCheckedAt: trend.checks[0] ? new Date(trend.checks[0].checkedAt) : null,
    lastCheckedAt: latest ? new Date(latest.checkedAt) : null,
    computedAt: new Date(),
  }, { transaction })
}

/** Every system's stored trend derived again from its checks (a database loaded in bulk, or from before them). */
export async function rebuildCycleTrends(
  write: <T>(work: (transaction: Transaction) => Promise<T>) => Promise<T>,
): Promise<number> {
  const systems = await CycleCheck.findAll({
    attributes: ['aircraftId', 'system'],
    where: { withdrawnAt: null },
    group: ['aircraftId', 'system'],
    raw: true,
  })
  for (const { aircraftId, system } of systems) {
    await write(async (transaction) => {
      const [trend] = await cycleTrends({ aircraftId, system }, transaction)
      await storeCycleTrend({ aircraftId, system }, trend, transaction)
    })
  }
  return systems.length
}

const toRow = (row: SystemCycleTrend, series: CycleTrendRow['series']): CycleTrendRow => ({
  aircraftId: row.aircraftId,
  registration: row.registration,
  system: row.system,
  accumulatorId: row.accumulatorId,
  checks: row.checks,
  baselineSeconds: row.baselineSeconds,
  latestSeconds: row.latestSeconds,
  latestLeakRate: row.latestLeakRate,
  drop: row.drop,
  flagged: row.flagged,
  message: row.message,
  lastCheckedAt: row.lastCheckedAt?.toISOString() ?? null,
  series,
})

/**
 * Each system's checks in date order, only for the systems asked for (the index on aircraft, system,
 * date), each series passed through `pick` before its dates are written out: a page of 25 systems reads
 * 2,700 checks and shows 60 points of each.
 */
async function seriesOf(
  keys: { aircraftId: number, system: string }[],
  pick: <T>(series: T[]) => T[] = series => series,
): Promise<Map<string, CycleTrendRow['series']>> {
  const found = new Map<string, CycleTrendRow['series']>()
  if (!keys.length) return found
  const checks = await CycleCheck.findAll({
    where: { withdrawnAt: null, [Op.or]: keys.map(key => ({ aircraftId: key.aircraftId, system: key.system })) },
    attributes: ['aircraftId', 'system', 'checkedAt', 'intervalSeconds'],
    // Each system's checks in date order, as the index on (aircraft, system, date) holds them: ordered by
    // date alone, SQLite walked the index of every check by date instead.
    order: [['aircraftId', 'ASC'], ['system', 'ASC'], ['checkedAt', 'ASC'], ['id', 'ASC']],
    raw: true,
  }) as unknown as { aircraftId: number, system: string, checkedAt: StoredDate, intervalSeconds: number }[]
  const grouped = new Map<string, typeof checks>()
  for (const check of checks) {
    const key = `${check.aircraftId}|${check.system}`
    const series = grouped.get(key)
    if (series) series.push(check)
    else grouped.set(key, [check])
  }
  for (const [key, series] of grouped) {
    const points = pick(series)
    found.set(key, points.map(point => ({
      checkedAt: storedDateIso(point.checkedAt),
      intervalSeconds: point.intervalSeconds,
    })))
  }
  return found
}

/** Flagged systems listed above the table: all of them up to this many, and how many there are. */
const FLAGGED_SHOWN = 50

/**
 * One page of the systems' pump-cycle trends, largest drop first, each with a chart series of at most
 * SERIES_POINTS points; and the flagged systems (up to FLAGGED_SHOWN, with their count). Read from the
 * stored trends: the cost is one page, whatever the fleet.
 */
export async function cycleTrendPage(
  query: { page: number, pageSize: number, flagged?: boolean },
  scope: Scope,
): Promise<CycleTrendPage> {
  const where = withinScope(scope, query.flagged === undefined ? {} : { flagged: query.flagged })
  const [total, rows, flaggedCount, flaggedRows] = await Promise.all([
    SystemCycleTrend.count({ where }),
    SystemCycleTrend.findAll({
      where,
      order: [['rank', 'DESC'], ['aircraftId', 'ASC'], ['system', 'ASC']],
      limit: query.pageSize,
      offset: (query.page - 1) * query.pageSize,
    }),
    SystemCycleTrend.count({ where: withinScope(scope, { flagged: true }) }),
    SystemCycleTrend.findAll({
      where: withinScope(scope, { flagged: true }),
      order: [['rank', 'DESC'], ['aircraftId', 'ASC'], ['system', 'ASC']],
      limit: FLAGGED_SHOWN,
    }),
  ])
  const series = await seriesOf(rows, downsample)
  return {
    items: rows.map(row => toRow(row, series.get(`${row.aircraftId}|${row.system}`) ?? [])),
    total,
    page: query.page,
    pageSize: query.pageSize,
    flagged: flaggedRows.map(row => toRow(row, [])),
    flaggedTotal: flaggedCount,
    dropShare: Number(useRuntimeConfig().cycleDropShare),
  }
}

/** One system's whole series of checks (a chart's "show all"), bounded by that one system's history. */
export async function systemCycleSeries(aircraftId: number, system: string, scope: Scope): Promise<CycleTrendRow['series']> {
  requireAircraftInScope(scope, aircraftId, 'Aircraft')
  return (await seriesOf([{ aircraftId, system }])).get(`${aircraftId}|${system}`) ?? []
}
