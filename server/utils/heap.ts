import { setFlagsFromString } from 'node:v8'

/**
 * How far V8 lets the heap grow past what was live at its last full collection, while a bulk job that makes
 * and drops a lot runs. By default V8 lets it grow up to four times under a high allocation rate, and the
 * records archive allocates fast (a record PDF every 40 ms, each built and dropped): streaming 10,000 records
 * took the server's resident memory from 393 to 616 MB, of which the live heap was never more than about
 * 170 MB. Growing by at most 20 % held the same archive (10,094 records, after a warm-up) to 247 → 266 MB, for
 * more frequent, shorter full collections (20.6 records/s against 25). Held that tight for every request, it
 * slowed a million-row CSV export from 15 s to 22 s, so it is tight only while such a job runs; V8 reads the
 * setting at every collection.
 */
const TIGHT_PERCENT = 20
let holders = 0

/** Runs `job` with the heap held tight (see above); the default returns when the last such job ends. */
export async function withTightHeap<T>(job: () => Promise<T>): Promise<T> {
  if (holders++ === 0) setFlagsFromString(`--heap-growing-percent=${TIGHT_PERCENT}`)
  try {
    return await job()
  }
  finally {
    // 0 is V8's own default: its growing factor chosen from the collector's speed.
    if (--holders === 0) setFlagsFromString('--heap-growing-percent=0')
  }
}
