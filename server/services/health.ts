import { ENGINE_VERSION } from '#shared/gas/version'
import { MIGRATION_NAMES } from '../database/migrate'

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

interface Check {
  ok: boolean
  detail: string
}

/**
 * Whether this server should be sent requests: started, every migration applied, the database answering and
 * taking writes, and its secrets present. Each check says why in words; any failed one makes it not ready.
 */
export async function readinessReport(): Promise<{ ready: boolean, checks: Record<string, Check> }> {
  const config = useRuntimeConfig()
  const checks: Record<string, Check> = {}
  checks.started = isReady()
    ? { ok: true, detail: 'Start-up work done.' }
    : { ok: false, detail: 'Still starting (opening and migrating the database, loading the renderer).' }
  const sessionPassword = String(config.session?.password ?? '')
  checks.secrets = sessionPassword.length >= 32
    ? { ok: true, detail: config.auditSecret ? 'Session password and audit secret set.' : 'Session password set; the audit secret is derived from it (set NUXT_AUDIT_SECRET in production).' }
    : { ok: false, detail: 'NUXT_SESSION_PASSWORD is missing or shorter than 32 characters.' }
  try {
    const sequelize = await useDB()
    const [applied] = await sequelize.query('SELECT name FROM schema_migrations') as [{ name: string }[], unknown]
    const pending = MIGRATION_NAMES.filter(name => !applied.some(row => row.name === name))
    checks.migrations = pending.length
      ? { ok: false, detail: `Not applied: ${pending.join(', ')}.` }
      : { ok: true, detail: `All ${MIGRATION_NAMES.length} applied (${MIGRATION_NAMES.at(-1)}).` }
    await sequelize.query('SELECT 1')
    const { healthy, report } = await healthReport()
    checks.database = healthy
      ? { ok: true, detail: 'Answering and taking writes.' }
      : report.status === 'starting'
        ? { ok: true, detail: 'Answering (writes are checked once started).' }
        : { ok: false, detail: `${String(report.database)}: ${String(report.problem ?? '')}`.trim() }
  }
  catch (error) {
    checks.migrations ??= { ok: false, detail: 'Could not be read.' }
    checks.database = { ok: false, detail: storageFault(error) ?? `The database does not answer: ${(error as Error).message}` }
  }
  return { ready: Object.values(checks).every(check => check.ok), checks }
}
