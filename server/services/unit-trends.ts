import { Op, UniqueConstraintError, type Transaction } from 'sequelize'
import { isEngineInputError } from '../../shared/gas/errors'
import { fitPrechargeTrend, normalisePrechargeReading, type PrechargeFit } from '../../shared/gas/leakage'
import { specificationPressure } from '../../shared/utils/specification-target'
import { assessUnitTrend, type UnitTrendFlag } from '../../shared/utils/trend-flags'
import { Accumulator, Aircraft, PrechargeReading, Specification, TrendAlert, UnitTrend, Worksheet } from '../models'
import { currentSpecification } from '../database/current-specification'

/**
 * Trends that cost nothing to read. When a worksheet is released its readings are stored,
 * each carried to the reference temperature of the unit's current specification; the unit's
 * trend is then refitted from its stored readings (linear in their number) and kept in
 * unit_trends, and its alert raised or cleared in the same transaction. Reading the trends
 * reads those tables. A new specification revision re-carries the readings of its units.
 */

type Reference = Parameters<typeof normalisePrechargeReading>[1]

function referenceOf(specification: Specification): Reference {
  return {
    pressure: specificationPressure(specification, specification.referencePressure),
    temperature: { value: specification.referenceTemperature, unit: specification.referenceTemperatureUnit },
  }
}

function normalise(reading: PrechargeReading['reading'], specification: Specification | null): number | null {
  if (!specification) return null
  try {
    return normalisePrechargeReading(reading, referenceOf(specification), specification.gasModel)
  }
  catch (error) {
    // A reading the engine cannot carry (outside the equation's range) is kept, unfitted.
    if (isEngineInputError(error)) return null
    throw error
  }
}

/** A released worksheet's readings: its as-found, and its as-left when a charge or vent started a new segment. */
function readingsOf(worksheet: Worksheet) {
  const content = worksheet.content
  if (!content.asFound || !content.conditions) return []
  const action = content.action?.kind ?? 'none'
  const found = {
    kind: 'as-found' as const,
    action,
    takenAt: new Date(content.asFound.recordedAt ?? worksheet.performedAt ?? worksheet.createdAt),
    reading: {
      pressure: content.asFound.reading,
      temperature: content.conditions.gasTemperature,
      ambient: content.conditions.ambient,
    },
    startsSegment: false,
  }
  if (action === 'none' || !content.asLeft) return [found]
  return [
    found,
    {
      kind: 'as-left' as const,
      action,
      takenAt: new Date(content.asLeft.recordedAt),
      reading: {
        pressure: content.asLeft.reading,
        temperature: content.asLeft.gasTemperature,
        ambient: content.conditions.ambient,
      },
      startsSegment: true,
    },
  ]
}

function readingRows(worksheet: Worksheet, specification: Specification | null) {
  return readingsOf(worksheet).map(row => ({
    ...row,
    accumulatorId: worksheet.accumulatorId,
    worksheetId: worksheet.id,
    specificationId: specification?.id ?? null,
    normalised: normalise(row.reading, specification),
  }))
}

/** Stores a just-released worksheet's readings, normalised against its unit's current specification. */
export async function storeReleasedReadings(worksheet: Worksheet, transaction: Transaction): Promise<void> {
  const partNumber = (worksheet.content).accumulator.partNumber
  const rows = readingRows(worksheet, await currentSpecification(partNumber, transaction))
  if (rows.length) await PrechargeReading.bulkCreate(rows, { transaction })
}

export async function removeReadings(worksheetId: number, transaction: Transaction): Promise<void> {
  await PrechargeReading.destroy({ where: { worksheetId }, transaction })
}

const yieldToOthers = () => new Promise(done => setImmediate(done))

/**
 * Carries a unit's stored readings to the current specification's reference again (after a
 * revision), a thousand at a time, letting other requests in between.
 */
export async function renormaliseUnit(
  accumulatorId: number,
  specification: Specification | null,
  write: <T>(work: (transaction: Transaction) => Promise<T>) => Promise<T>,
): Promise<void> {
  let afterId = 0
  for (;;) {
    const rows = await PrechargeReading.findAll({
      where: {
        accumulatorId,
        id: { [Op.gt]: afterId },
        specificationId: { [Op.or]: [null, { [Op.ne]: specification?.id ?? -1 }] },
      },
      order: [['id', 'ASC']],
      limit: 1000,
    })
    if (rows.length === 0) break
    await write(async (transaction) => {
      for (const row of rows)
        await row.update(
          { specificationId: specification?.id ?? null, normalised: normalise(row.reading, specification) },
          { transaction },
        )
    })
    afterId = rows.at(-1)!.id
    await yieldToOthers()
  }
}

export interface AlertChange {
  kind: 'precharge' | 'cycle' | 'integrity'
  subject: string
  message: string
}

/**
 * Raises or clears one flag's alert inside the caller's transaction. At most one alert per
 * subject is open, by a unique index: of two servers raising the same flag at once, one
 * inserts it (and mails), the other finds it raised. Returns the alert when newly raised.
 */
export async function syncAlert(
  kind: AlertChange['kind'],
  subject: string,
  flagged: boolean,
  message: string,
  transaction: Transaction,
): Promise<AlertChange | null> {
  const open = await TrendAlert.findOne({ where: { subject, clearedAt: null }, transaction })
  if (!flagged) {
    if (open) await open.update({ clearedAt: new Date() }, { transaction })
    return null
  }
  if (open) return null
  try {
    // A savepoint, so a lost race does not abort the caller's transaction (PostgreSQL would).
    await TrendAlert.sequelize!.transaction({ transaction }, savepoint =>
      TrendAlert.create({ kind, subject, message, raisedAt: new Date(), clearedAt: null }, { transaction: savepoint }),
    )
  }
  catch (error) {
    if (error instanceof UniqueConstraintError) return null
    throw error
  }
  return { kind, subject, message }
}

export interface StoredUnitTrend {
  fit: PrechargeFit | null
  flag: UnitTrendFlag
  services: number
  lastServiceAt: Date | null
  specification: Specification | null
}

/** Refits one unit's trend from its stored readings, keeps it, and raises or clears its alert. */
export async function refreshUnitTrend(accumulatorId: number, transaction: Transaction): Promise<AlertChange | null> {
  const accumulator = await Accumulator.findByPk(accumulatorId, {
    include: [{ model: Aircraft, as: 'aircraft' }],
    transaction,
  })
  if (!accumulator) return null
  const specification = await currentSpecification(accumulator.partNumber, transaction)
  const rows = await PrechargeReading.findAll({
    where: { accumulatorId },
    attributes: ['worksheetId', 'takenAt', 'normalised', 'startsSegment', 'specificationId'],
    order: [
      ['takenAt', 'ASC'],
      ['id', 'ASC'],
    ],
    transaction,
  })
  const services = new Set(rows.map(row => row.worksheetId)).size
  const lastServiceAt = rows.at(-1)?.takenAt ?? null
  let fit: PrechargeFit | null = null
  let reasons: string[] = []
  if (specification && rows.length) {
    try {
      fit = fitPrechargeTrend({
        points: rows
          .filter(row => row.normalised !== null && row.specificationId === specification.id)
          .map(row => ({
            takenAt: row.takenAt.toISOString(),
            value: row.normalised!,
            startsSegment: row.startsSegment,
          })),
        reference: referenceOf(specification),
        tolerance: {
          minus: specification.toleranceMinus,
          plus: specification.tolerancePlus,
          unit: specification.toleranceUnit,
        },
        model: specification.gasModel,
      })
    }
    catch (error) {
      // One unit's impossible figures must not take the fleet's trends down with it: say why this one has none.
      if (!isEngineInputError(error)) throw error
      reasons = [`No trend: ${error.message}`]
    }
  }
  const flag: UnitTrendFlag = fit
    ? assessUnitTrend(fit, {
        lossThresholdPerDay: specification!.lossThresholdPerDay,
        checkIntervalDays: specification!.checkIntervalDays,
        lastServiceAt: lastServiceAt?.toISOString() ?? null,
      })
    : { flagged: false, reasons, nextCheckAt: null, lossPerDay: null }
  const { normalised: _points, inputs: _inputs, ...kept } = (fit ?? {}) as PrechargeFit & { inputs?: unknown }
  await UnitTrend.upsert(
    {
      accumulatorId,
      specificationId: specification?.id ?? null,
      fit: fit ? kept : null,
      flag,
      lossPerDay: flag.lossPerDay,
      flagged: flag.flagged,
      services,
      lastServiceAt,
      computedAt: new Date(),
    },
    { transaction },
  )
  const aircraft = (accumulator as Accumulator & { aircraft?: Aircraft }).aircraft
  const message = `${aircraft?.registration ?? 'Stores'} ${accumulator.position ?? ''} (P/N ${accumulator.partNumber} S/N ${accumulator.serialNumber}) is losing pre-charge. ${flag.reasons.join(' ')}`
  return syncAlert('precharge', `precharge:${accumulatorId}`, flag.flagged, message, transaction)
}

/**
 * Rebuilds every stored reading and unit trend from the released worksheets: for a database
 * from before stored readings, or after a bulk load. In batches, yielding between them.
 */
export async function rebuildTrends(
  write: <T>(work: (transaction: Transaction) => Promise<T>) => Promise<T>,
  log?: (line: string) => void,
): Promise<number> {
  await write(transaction => PrechargeReading.destroy({ where: {}, transaction }))
  const specifications = new Map(
    (await Specification.findAll({ where: { status: 'current' } })).map(specification => [
      specification.partNumber,
      specification,
    ]),
  )
  let afterId = 0
  let stored = 0
  for (;;) {
    const batch = await Worksheet.findAll({
      where: { state: 'released', id: { [Op.gt]: afterId } },
      attributes: ['id', 'accumulatorId', 'content', 'performedAt', 'createdAt', 'partNumber'],
      order: [['id', 'ASC']],
      limit: 500,
    })
    if (batch.length === 0) break
    const rows = batch.flatMap(worksheet =>
      readingRows(worksheet, specifications.get(worksheet.partNumber ?? '') ?? null),
    )
    await write(transaction => PrechargeReading.bulkCreate(rows, { transaction }))
    stored += batch.length
    afterId = batch.at(-1)!.id
    if (log && stored % 20_000 < 500) log(`  trends: ${stored} released worksheets read`)
    await yieldToOthers()
  }
  for (const { id } of await Accumulator.findAll({ attributes: ['id'] })) {
    await write(transaction => refreshUnitTrend(id, transaction))
    await yieldToOthers()
  }
  return stored
}
