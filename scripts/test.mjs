// `npm test`: every test (engine and shared rules, stores and composables in the Nuxt runtime, routes
// against the built server, real Chromium) on SQLite, then
// the route tests again on PostgreSQL, on a throwaway cluster this script starts and stops
// (Debian's postgresql package). Where PostgreSQL is not installed that second leg is skipped
// with a note, unless CHARGEWELL_REQUIRE_POSTGRES=1 (as .ci/run sets), which makes it a failure.
// Arguments are passed to vitest (e.g. `npm test -- --project unit`); with any, only that runs.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

const vitest = (args, env = {}) => spawnSync('npx', ['vitest', 'run', ...args], { stdio: 'inherit', env: { ...process.env, ...env } }).status ?? 1
const extra = process.argv.slice(2)
// The whole run starts with the house rules: lint (line length ≤ 120 among them) and the type check.
if (extra.length === 0) {
  for (const script of ['lint', 'typecheck']) {
    const status = spawnSync('npm', ['run', script], { stdio: 'inherit' }).status
    if (status !== 0) process.exit(status ?? 1)
  }
}
if (extra.length) process.exit(vitest(extra))
// The fast tiers first (the engine and shared rules, then stores and composables in the Nuxt runtime), on
// their own: the next step builds the app, which rewrites .nuxt/ while the Nuxt tier would be reading it.
const fast = vitest(['--project', 'unit', '--project', 'nuxt'])
if (fast !== 0) process.exit(fast)
const sqlite = vitest(['--project', 'api', '--project', 'e2e'])
if (sqlite !== 0) process.exit(sqlite)

const installed = existsSync('/usr/lib/postgresql') && readdirSync('/usr/lib/postgresql').length > 0
if (!process.env.CHARGEWELL_TEST_DATABASE_URL && !installed) {
  const required = process.env.CHARGEWELL_REQUIRE_POSTGRES === '1'
  console.log(`\nPostgreSQL is not installed here: ${required ? 'it is required (CHARGEWELL_REQUIRE_POSTGRES=1).' : 'skipped the route tests on PostgreSQL (apt-get install postgresql to run them).'}`)
  process.exit(required ? 1 : 0)
}

let folder
let url = process.env.CHARGEWELL_TEST_DATABASE_URL
let stop
if (!url) {
  folder = mkdtempSync(join(tmpdir(), 'chargewell-pg-'))
  const port = String(56000 + Math.floor(Math.random() * 2000))
  url = execFileSync('scripts/postgres-throwaway.sh', [folder, port], { encoding: 'utf8' }).trim().split('\n').pop()
  const bin = readdirSync('/usr/lib/postgresql').sort().map(version => `/usr/lib/postgresql/${version}/bin`).pop()
  stop = () => {
    const command = `'${bin}/pg_ctl' -D '${folder}/data' -m immediate stop`
    spawnSync(process.getuid?.() === 0 ? 'su' : 'sh', process.getuid?.() === 0 ? ['postgres', '-s', '/bin/sh', '-c', command] : ['-c', command], { stdio: 'ignore' })
    rmSync(folder, { recursive: true, force: true })
  }
}
console.log(`\nThe route tests again, on PostgreSQL (${url.replace(/\/\/[^@/]*@/, '//…@')}):\n`)
let postgres
try {
  // The build of the first leg is reused.
  postgres = vitest(['--project', 'api'], { CHARGEWELL_TEST_DATABASE_URL: url, CHARGEWELL_SKIP_BUILD: '1' })
}
finally {
  stop?.()
}
process.exit(postgres ?? 1)
