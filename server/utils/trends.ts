import { Op } from 'sequelize'
import { isEngineInputError } from '../../shared/gas/errors'
import { prechargeTrend, type PrechargeTrendResult } from '../../shared/gas/leakage'
import type { WorksheetContent } from '../../shared/types/worksheet'
import { cycleTrend, type CycleTrend } from '../../shared/utils/cycle-check'
import { specificationPressure } from '../../shared/utils/specification-target'
import { assessUnitTrend, type UnitTrendFlag } from '../../shared/utils/trend-flags'
import { Accumulator, Aircraft, CycleCheck, Specification, TrendAlert, User, Worksheet } from '../models'

export interface UnitTrend {
  accumulator: { id: number, partNumber: string, serialNumber: string, position: string | null }
  aircraft: { id: number, registration: string, type: string, base: string } | null
  specification: { id: number, partNumber: string, revision: string, pressureUnit: string, pressureBasis: string } | null
  trend: PrechargeTrendResult | null
  flag: UnitTrendFlag
  /** Each released service: as-found and as-left carried to the reference temperature. */
  services: { worksheetId: number, performedAt: string, asFound: number, asLeft: number, action: string }[]
}

/**
 * One unit's pre-charge trend from its released worksheets: every as-found starts or
 * continues a segment; an as-left after a charge or vent starts a new one.
 */
export async function unitTrend(accumulator: Accumulator & { aircraft?: Aircraft }): Promise<UnitTrend> {
  const specification = await Specification.findOne({ where: { partNumber: accumulator.partNumber, status: 'current' } })
  const worksheets = await Worksheet.findAll({ where: { accumulatorId: accumulator.id, state: 'released' }, order: [['performedAt', 'ASC']] })
  const base = {
    accumulator: { id: accumulator.id, partNumber: accumulator.partNumber, serialNumber: accumulator.serialNumber, position: accumulator.position },
    aircraft: accumulator.aircraft ? { id: accumulator.aircraft.id, registration: accumulator.aircraft.registration, type: accumulator.aircraft.type, base: accumulator.aircraft.base } : null,
    specification: specification ? { id: specification.id, partNumber: specification.partNumber, revision: specification.revision, pressureUnit: specification.pressureUnit, pressureBasis: specification.pressureBasis } : null,
  }
  const noTrend = { ...base, trend: null, services: [], flag: { flagged: false, reasons: [], nextCheckAt: null, lossPerDay: null } }
  if (!specification || worksheets.length === 0) return noTrend
  const readings = worksheets.flatMap((worksheet) => {
    const content = worksheet.content as unknown as WorksheetContent
    if (!content.asFound || !content.conditions) return []
    const taken = content.asFound.recordedAt ?? worksheet.performedAt?.toISOString()
    const found = { takenAt: taken, pressure: content.asFound.reading, temperature: content.conditions.gasTemperature, ambient: content.conditions.ambient }
    const recharged = content.action && content.action.kind !== 'none' && content.asLeft
    return recharged
      ? [found, { takenAt: content.asLeft!.recordedAt, pressure: content.asLeft!.reading, temperature: content.asLeft!.gasTemperature, ambient: content.conditions.ambient, startsSegment: true }]
      : [found]
  })
  let trend: PrechargeTrendResult
  try {
    trend = prechargeTrend({
      readings,
      reference: { pressure: specificationPressure(specification, specification.referencePressure), temperature: { value: specification.referenceTemperature, unit: specification.referenceTemperatureUnit } },
      tolerance: { minus: specification.toleranceMinus, plus: specification.tolerancePlus, unit: specification.toleranceUnit },
      model: specification.gasModel,
    })
  }
  catch (error) {
    // One unit's impossible figures must not take the fleet's trends down with it: say why this one has none.
    if (!isEngineInputError(error)) throw error
    return { ...noTrend, flag: { ...noTrend.flag, reasons: [`No trend: ${error.message}`] } }
  }
  const flag = assessUnitTrend(trend, { lossThresholdPerDay: specification.lossThresholdPerDay, checkIntervalDays: specification.checkIntervalDays, lastServiceAt: worksheets.at(-1)!.performedAt?.toISOString() ?? null })
  let cursor = 0
  const services = worksheets.map((worksheet) => {
    const content = worksheet.content as unknown as WorksheetContent
    const recharged = content.action && content.action.kind !== 'none' && content.asLeft
    const asFound = trend.normalised[cursor++]?.value ?? Number.NaN
    const asLeft = recharged ? trend.normalised[cursor++]?.value ?? Number.NaN : asFound
    return { worksheetId: worksheet.id, performedAt: worksheet.performedAt?.toISOString() ?? '', asFound, asLeft, action: content.action?.kind ?? 'none' }
  })
  return { ...base, trend, flag, services }
}

/** Every installed unit's trend, ranked by loss rate (fastest loss first), with the register filters. */
export async function fleetPrechargeTrends(filters: { type?: string, base?: string, position?: string, partNumber?: string } = {}): Promise<UnitTrend[]> {
  const accumulators = await Accumulator.findAll({
    where: {
      aircraftId: { [Op.ne]: null },
      ...(filters.partNumber ? { partNumber: filters.partNumber } : {}),
      ...(filters.position ? { position: { [Op.like]: `%${filters.position}%` } } : {}),
      ...(filters.type ? { '$aircraft.type$': filters.type } : {}),
      ...(filters.base ? { '$aircraft.base$': filters.base } : {}),
    },
    include: [{ model: Aircraft, as: 'aircraft' }],
  })
  const trends = await Promise.all(accumulators.map(unitTrend))
  return trends.sort((a, b) => (b.flag.lossPerDay ?? -Infinity) - (a.flag.lossPerDay ?? -Infinity))
}

export async function fleetCycleTrends(): Promise<CycleTrend[]> {
  const checks = await CycleCheck.findAll({ include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration'] }], order: [['checkedAt', 'ASC']] })
  const groups = new Map<string, CycleCheck[]>()
  for (const check of checks) groups.set(`${check.aircraftId}|${check.system}`, [...(groups.get(`${check.aircraftId}|${check.system}`) ?? []), check])
  const dropShare = Number(useRuntimeConfig().cycleDropShare)
  return [...groups.values()].map((group) => {
    const first = group[0]! as CycleCheck & { aircraft?: Aircraft }
    return cycleTrend({
      aircraftId: first.aircraftId,
      registration: first.aircraft?.registration ?? '',
      system: first.system,
      accumulatorId: group.at(-1)!.accumulatorId,
      checks: group.map(check => ({ checkedAt: check.checkedAt.toISOString(), intervalSeconds: check.intervalSeconds, leakRate: (check.results as { leakRate: { value: number, unit: string } }).leakRate })),
    }, dropShare)
  }).sort((a, b) => (b.drop ?? -1) - (a.drop ?? -1))
}

/**
 * Raises an alert (one e-mail to every engineer) for each flag that has no open alert yet,
 * and clears open alerts whose trend no longer flags.
 */
export async function evaluateTrendAlerts(): Promise<{ raised: number, cleared: number }> {
  const units = await fleetPrechargeTrends()
  const cycles = await fleetCycleTrends()
  const current = new Map<string, { kind: 'precharge' | 'cycle', message: string }>()
  for (const unit of units) {
    if (unit.flag.flagged) current.set(`precharge:${unit.accumulator.id}`, { kind: 'precharge', message: `${unit.aircraft?.registration ?? 'Stores'} ${unit.accumulator.position ?? ''} (P/N ${unit.accumulator.partNumber} S/N ${unit.accumulator.serialNumber}) is losing pre-charge. ${unit.flag.reasons.join(' ')}` })
  }
  for (const cycle of cycles) {
    if (cycle.flagged) current.set(`cycle:${cycle.aircraftId}:${cycle.system}`, { kind: 'cycle', message: `${cycle.registration} ${cycle.system}: ${cycle.message}` })
  }
  // Cleared and raised in one write, re-read inside it: two evaluations at once raise a flag once.
  const { raised, cleared } = await writeTransaction(async (transaction) => {
    const open = await TrendAlert.findAll({ where: { clearedAt: null }, transaction })
    const stale = open.filter(alert => !current.has(alert.subject))
    if (stale.length) await TrendAlert.update({ clearedAt: new Date() }, { where: { id: stale.map(alert => alert.id) }, transaction })
    const openSubjects = new Set(open.map(alert => alert.subject))
    const fresh = [...current].filter(([subject]) => !openSubjects.has(subject))
    for (const [subject, { kind, message }] of fresh) await TrendAlert.create({ kind, subject, message, raisedAt: new Date(), clearedAt: null }, { transaction })
    return { raised: fresh.map(([, alert]) => alert), cleared: stale.length }
  })
  const engineers = (await User.findAll({ where: { disabled: false } })).filter(user => user.roles.includes('engineer'))
  const link = `${useRuntimeConfig().publicUrl}/trends`
  for (const { kind, message } of raised) {
    await Promise.all(engineers.map(engineer => sendMail({ to: engineer.email, kind: `trend-${kind}`, subject: `Trend alert: ${message.slice(0, 90)}`, text: `${message}\n\nSee ${link}\n\nThe approved maintenance data and local regulations govern.` })))
  }
  return { raised: raised.length, cleared }
}
