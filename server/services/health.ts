import { ENGINE_VERSION } from '#shared/gas/version'

/**
 * How the server is doing, for load balancers, devices' connection checks and administrators:
 * whether the database answers and whether it takes writes (a full disk or a read-only file shows
 * here, not as 500s elsewhere). Writability is the last write's outcome when recent, else a probe
 * (one row rewritten, at most every PROBE_EVERY_MS).
 */
const PROBE_EVERY_MS = 15_000
let probing: Promise<void> | null = null

async function probeWrite(): Promise<void> {
  const sequelize = await useDB()
  await writeTransaction(transaction =>
    sequelize.query('UPDATE health_probes SET probed_at = :now WHERE id = 1', { replacements: { now: new Date() }, transaction }),
  ).catch(() => undefined /* remembered by writeTransaction */)
}

export async function healthReport(): Promise<{ healthy: boolean, report: Record<string, unknown> }> {
  const common = { engineVersion: ENGINE_VERSION, time: new Date().toISOString(), eventLoop: eventLoopDelay() }
  if (!isReady()) return { healthy: false, report: { status: 'starting', ...common } }
  try {
    const sequelize = await useDB()
    await sequelize.query('SELECT 1')
  }
  catch (error) {
    return {
      healthy: false,
      report: { status: 'degraded', database: 'unreachable', problem: storageFault(error) ?? 'The database does not answer.', ...common },
    }
  }
  if (Date.now() - lastWriteOutcome().at > PROBE_EVERY_MS) {
    probing ??= probeWrite().finally(() => (probing = null))
    await probing
  }
  const write = lastWriteOutcome()
  return write.ok
    ? { healthy: true, report: { status: 'ok', database: 'ok', ...common } }
    : { healthy: false, report: { status: 'degraded', database: 'not writable', problem: write.problem, ...common } }
}
