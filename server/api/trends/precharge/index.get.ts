import { trendQuerySchema } from '../../../../shared/schemas/cycle-check'

/** Installed units ranked by pre-charge loss rate, each with `lossRate` (per day, positive = losing gas) and `flagged`. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(trendQuerySchema))
  await evaluateTrendAlerts()
  const units = await fleetPrechargeTrends(query)
  const items = units.map(unit => ({
    accumulatorId: unit.accumulator.id,
    registration: unit.aircraft?.registration ?? null,
    type: unit.aircraft?.type ?? null,
    base: unit.aircraft?.base ?? null,
    position: unit.accumulator.position,
    partNumber: unit.accumulator.partNumber,
    serialNumber: unit.accumulator.serialNumber,
    unit: unit.specification ? `${unit.specification.pressureUnit}/day` : null,
    lossRate: unit.flag.lossPerDay,
    lossRateStandardError: unit.trend?.lossRateStandardError ?? null,
    predictedOutOfLimitsAt: unit.trend?.predictedOutOfLimitsAt ?? null,
    nextCheckAt: unit.flag.nextCheckAt,
    flagged: unit.flag.flagged,
    reasons: unit.flag.reasons,
    services: unit.services.length,
  }))
  return { items: query.flagged === undefined ? items : items.filter(item => item.flagged === query.flagged) }
})
