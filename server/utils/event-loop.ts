import { monitorEventLoopDelay } from 'node:perf_hooks'

/**
 * How long the event loop has been held up: no request may block it for more than 50 ms
 * (issue 11). Kept in windows of five seconds for the last half hour, so a benchmark can read
 * the worst delay while it ran. Reported by /api/health.
 */
const WINDOW_MS = 5_000
const WINDOWS_KEPT = 360
const RESOLUTION_MS = 10
let histogram: ReturnType<typeof monitorEventLoopDelay> | undefined
const windows: { endedAt: string, maxMs: number }[] = []
let worst = 0

// The histogram measures in nanoseconds and counts its own sampling interval as delay.
const delayOf = (nanoseconds: number) => Math.max(0, nanoseconds / 1e6 - RESOLUTION_MS)

export function startEventLoopMonitor(): void {
  if (histogram) return
  histogram = monitorEventLoopDelay({ resolution: RESOLUTION_MS })
  histogram.enable()
  setInterval(() => {
    const maxMs = delayOf(histogram!.max)
    worst = Math.max(worst, maxMs)
    windows.push({ endedAt: new Date().toISOString(), maxMs: Math.round(maxMs) })
    if (windows.length > WINDOWS_KEPT) windows.shift()
    histogram!.reset()
  }, WINDOW_MS).unref()
}

export function eventLoopDelay() {
  if (!histogram) return null
  const current = delayOf(histogram.max)
  return { maxDelayMs: Math.round(Math.max(worst, current)), currentWindowMaxMs: Math.round(current), windows }
}
