import { leakRate, type LeakRateResult } from '../gas/leakage'
import type { CycleCheckBody } from '../schemas/cycle-check'
import type { SpecificationDto } from '../types/registers'
import { specificationPressure } from './specification-target'

/**
 * The fluid leak rate a cycle check implies, from the system accumulator's gas volume and
 * pre-charge (its specification), isothermal at the fluid temperature.
 */
export function cycleCheckLeakRate(
  body: CycleCheckBody,
  specification: Pick<
    SpecificationDto,
    | 'gasVolume'
    | 'gasVolumeUnit'
    | 'referencePressure'
    | 'pressureUnit'
    | 'pressureBasis'
    | 'referenceTemperature'
    | 'referenceTemperatureUnit'
    | 'gasModel'
  >,
): LeakRateResult {
  return leakRate({
    gasVolume: { value: specification.gasVolume, unit: specification.gasVolumeUnit },
    precharge: specificationPressure(specification, specification.referencePressure),
    prechargeTemperature: { value: specification.referenceTemperature, unit: specification.referenceTemperatureUnit },
    temperature: body.fluidTemperature,
    cutOut: body.cutOut,
    cutIn: body.cutIn,
    interval: body.interval,
    ambient: body.ambient,
    model: specification.gasModel,
  })
}

export interface CycleTrend {
  aircraftId: number
  registration: string
  system: string
  accumulatorId: number
  checks: { checkedAt: string, intervalSeconds: number, leakRate: { value: number, unit: string } }[]
  baselineSeconds: number | null
  latestSeconds: number | null
  /** Share by which the latest interval is below the baseline (0.3 = 30 % shorter). */
  drop: number | null
  flagged: boolean
  message: string | null
}

/** Checks that form a system's baseline: its first three. */
export const BASELINE_CHECKS = 3

/** The interval trend of one system against its own baseline (the mean of its first checks). */
export function cycleTrend(
  base: Omit<CycleTrend, 'baselineSeconds' | 'latestSeconds' | 'drop' | 'flagged' | 'message'>,
  dropShare: number,
): CycleTrend {
  const sorted = [...base.checks].sort((a, b) => Date.parse(a.checkedAt) - Date.parse(b.checkedAt))
  const baselineChecks = sorted.slice(0, BASELINE_CHECKS)
  const baselineSeconds = baselineChecks.length
    ? baselineChecks.reduce((total, check) => total + check.intervalSeconds, 0) / baselineChecks.length
    : null
  const latest = sorted.length > BASELINE_CHECKS ? sorted.at(-1)! : null
  const drop = baselineSeconds && latest ? 1 - latest.intervalSeconds / baselineSeconds : null
  const flagged = drop !== null && drop > dropShare
  return {
    ...base,
    checks: sorted,
    baselineSeconds,
    latestSeconds: latest?.intervalSeconds ?? null,
    drop,
    flagged,
    message: flagged
      ? `Cut-out to cut-in interval ${Math.round(drop! * 100)} % shorter than its baseline: a fluid leak (external, or internal past a seal, which also heats the fluid) — or a low pre-charge, which shortens the interval too. Check the accumulator's pre-charge first.`
      : null,
  }
}

/** Points a chart gets per system: enough to see a trend on a tablet, bounded whatever the history. */
export const SERIES_POINTS = 60

/**
 * A series cut to at most `points`: the baseline checks and the latest always kept, the rest evenly
 * spaced between them (the full series is one request away, per system).
 */
export function downsample<T>(series: T[], points = SERIES_POINTS, keepFirst = 3): T[] {
  if (series.length <= points) return series
  const head = series.slice(0, keepFirst)
  const rest = series.slice(keepFirst)
  const room = points - keepFirst
  const picked = Array.from({ length: room }, (_, index) => rest[Math.round((index * (rest.length - 1)) / (room - 1))]!)
  return [...head, ...picked]
}
