import { mailAlerts } from './notifications'
import { currentSpecification } from './specifications'
import { Op, type Transaction } from 'sequelize'
import type { FleetTrendRow, UnitTrendDto } from '#shared/types/trends'
import { cycleTrend, type CycleTrend } from '#shared/utils/cycle-check'
import { specificationPressure } from '#shared/utils/specification-target'
import {
  refreshUnitTrend,
  removeReadings,
  renormaliseUnit,
  storeReleasedReadings,
  syncAlert,
  type AlertChange,
} from '../database/trend-store'
import {
  Accumulator,
  Aircraft,
  CycleCheck,
  PrechargeReading,
  Specification,
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
}

/** Installed units ranked by loss rate (fastest loss first), from the stored trends. */
export async function fleetPrechargeTrends(filters: FleetTrendFilters = {}): Promise<FleetTrendRow[]> {
  const units = await Accumulator.findAll({
    where: {
      aircraftId: { [Op.ne]: null },
      ...(filters.partNumber ? { partNumber: filters.partNumber } : {}),
      ...(filters.position ? { position: { [likeOperator()]: `%${filters.position}%` } } : {}),
      ...(filters.type ? { '$aircraft.type$': filters.type } : {}),
      ...(filters.base ? { '$aircraft.base$': filters.base } : {}),
      ...(filters.flagged !== undefined ? { '$trend.flagged$': filters.flagged } : {}),
    },
    include: [
      { model: Aircraft, as: 'aircraft' },
      { model: UnitTrend, as: 'trend', required: false },
    ],
  })
  const pressureUnits = new Map(
    (await Specification.findAll({ where: { status: 'current' }, attributes: ['partNumber', 'pressureUnit'] })).map(
      row => [row.partNumber, row.pressureUnit],
    ),
  )
  return units
    .map((unit) => {
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
    .sort((a, b) => (b.lossRate ?? -Infinity) - (a.lossRate ?? -Infinity))
}

/** One unit's trend with its points and services, from the stored readings. */
export async function unitTrend(accumulatorId: number): Promise<UnitTrendDto> {
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
