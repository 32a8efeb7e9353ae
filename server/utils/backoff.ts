/** The wait before the next try after `attempts` failed ones: `firstRetryMs`, doubling, at most an hour. */
export function retryBackoffMs(attempts: number, firstRetryMs: number): number {
  return Math.min(3_600_000, firstRetryMs * 2 ** Math.max(0, attempts - 1))
}
