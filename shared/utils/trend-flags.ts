import type { PrechargeFit } from '../gas/leakage'

export interface UnitTrendSettings {
  /** Loss, pressure units per day, above which the engineer wants to know (per specification). */
  lossThresholdPerDay: number | null
  /** Days between scheduled checks (per specification). */
  checkIntervalDays: number | null
  /** The last released service of the unit. */
  lastServiceAt: string | null
}

export interface UnitTrendFlag {
  flagged: boolean
  reasons: string[]
  nextCheckAt: string | null
  /** Loss rate, positive when losing gas, and its standard error. */
  lossPerDay: number | null
}

/** Two standard errors: a slope this far from zero is not read as noise (about 95 % for a normal error). */
const SIGNIFICANCE = 2

/**
 * Whether a unit's pre-charge trend needs an engineer: its loss rate is above the threshold, or
 * the fitted line leaves the band before the next scheduled check. Either only counts when the
 * loss is clear of the noise (more than two standard errors), so scatter alone never flags a unit.
 */
export function assessUnitTrend(trend: Omit<PrechargeFit, 'normalised'>, settings: UnitTrendSettings): UnitTrendFlag {
  const loss = trend.lossRatePerDay === undefined ? null : -trend.lossRatePerDay
  const error = trend.lossRateStandardError ?? 0
  const nextCheckAt
    = settings.lastServiceAt && settings.checkIntervalDays
      ? new Date(Date.parse(settings.lastServiceAt) + settings.checkIntervalDays * 86_400_000).toISOString()
      : null
  const reasons: string[] = []
  const clearLoss
    = loss !== null && loss > 0 && (trend.fit?.degreesOfFreedom ?? 0) > 0 ? loss - SIGNIFICANCE * error : null
  if (clearLoss !== null && clearLoss > 0) {
    if (settings.lossThresholdPerDay !== null && clearLoss > settings.lossThresholdPerDay) {
      reasons.push(
        `Losing ${loss!.toFixed(2)} ± ${error.toFixed(2)} a day, above the alert threshold of ${settings.lossThresholdPerDay} a day.`,
      )
    }
    if (trend.predictedOutOfLimitsAt && nextCheckAt && trend.predictedOutOfLimitsAt < nextCheckAt) {
      reasons.push(
        `Predicted below the band on ${trend.predictedOutOfLimitsAt.slice(0, 10)}, before the next scheduled check (${nextCheckAt.slice(0, 10)}).`,
      )
    }
  }
  return { flagged: reasons.length > 0, reasons, nextCheckAt, lossPerDay: loss }
}
