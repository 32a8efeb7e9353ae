/**
 * `npm run bench:scale`: Chargewell with a fleet's records for years. Builds a database that looks
 * like a fleet (whole fleet copies, at most ten years of history, open work per copy; see
 * scale-database.ts) of 100,000 worksheets (SCALE_WORKSHEETS to change it; several sizes, such as
 * 10000,100000,1000000, are measured in turn and each route's growth printed) with signatures and a
 * valid, sealed audit chain, starts the built server on it, and prints p50/p95 of the reads and
 * the server-rendered pages people open all day,
 * the full CSV export's time and the server's memory growth during it, the calculation route's
 * throughput against /api/health, and the longest the event loop was blocked. Printed, never
 * asserted: the targets are in issue 11 and in the note of the stop that measured them.
 *
 * With NUXT_DATABASE_URL=postgres://… the same runs against PostgreSQL.
 */
import { execFileSync, spawn } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { setTimeout as pause } from 'node:timers/promises'
import autocannon from 'autocannon'
import { freePort } from '../support/ports'
import { buildScaleDatabase } from './scale-database'

const root = resolve(import.meta.dirname, '../..')
/** One size or several, comma-separated (e.g. 10000,1000000): several print each route's growth. */
const COUNTS = (process.env.SCALE_WORKSHEETS ?? '100000').split(',').map(Number)
const REPEATS = Number(process.env.SCALE_REPEATS ?? 40)

const percentile = (values: number[], share: number) =>
  [...values].sort((a, b) => a - b)[Math.min(values.length - 1, Math.floor(values.length * share))]!
const rssOf = (pid: number) => Number(readFileSync(`/proc/${pid}/status`, 'utf8').match(/VmRSS:\s+(\d+)/)![1]) / 1024

async function main() {
  if (process.env.CHARGEWELL_SKIP_BUILD !== '1' || !existsSync(join(root, '.output/server/index.mjs')))
    execFileSync('npx', ['nuxt', 'build'], { cwd: root, stdio: 'inherit' })
  if (COUNTS.length > 1 && process.env.NUXT_DATABASE_URL)
    throw new Error('Several sizes build a database each: run one size at a time on PostgreSQL.')
  if (COUNTS.length > 1 && process.env.SCALE_DATABASE && !process.env.SCALE_DATABASE.includes('{count}'))
    throw new Error('Several sizes keep a database each: put {count} in SCALE_DATABASE (e.g. /tmp/scale-{count}.sqlite).')
  const results: { count: number, rows: [string, number, number][] }[] = []
  for (const count of COUNTS) results.push({ count, rows: await measureAt(count) })
  if (results.length > 1) {
    const first = results[0]!
    const last = results.at(-1)!
    console.log(`\nGrowth of p50 from ${first.count} to ${last.count} worksheets:\n`)
    console.log(`| request | p50 at ${first.count} | p50 at ${last.count} | growth |\n|---|---|---|---|`)
    for (const [label, p50] of first.rows) {
      const at = last.rows.find(row => row[0].replace(/\d+/g, 'N') === label.replace(/\d+/g, 'N'))
      if (at) console.log(`| ${label.replace(/\d+/g, 'N')} | ${p50.toFixed(1)} | ${at[1].toFixed(1)} | ${(at[1] / p50).toFixed(2)}× |`)
    }
  }
}

/** Builds (or reuses) a database of `COUNT` worksheets, measures it, prints the figures and answers the rows. */
async function measureAt(COUNT: number): Promise<[string, number, number][]> {
  const folder = mkdtempSync(join(tmpdir(), 'chargewell-scale-'))
  // SCALE_DATABASE=<file> keeps the built database (and its secret) to reuse on the next run; {count}
  // in it stands for the size.
  const kept = process.env.SCALE_DATABASE?.replaceAll('{count}', String(COUNT))
  const databasePath = kept ?? join(folder, 'scale.sqlite')
  const secretFile = `${databasePath}.secret`
  // On PostgreSQL (NUXT_DATABASE_URL) the database named there is built afresh each run: give an empty one.
  const postgresUrl = process.env.NUXT_DATABASE_URL || ''
  let secret = kept && existsSync(secretFile) ? readFileSync(secretFile, 'utf8') : randomBytes(32).toString('hex')
  if (postgresUrl || !kept || !existsSync(databasePath)) {
    secret = randomBytes(32).toString('hex')
    console.log(`Building a database of ${COUNT} worksheets on ${postgresUrl ? 'PostgreSQL' : 'SQLite'}…`)
    const buildStarted = Date.now()
    await buildScaleDatabase(postgresUrl || databasePath, COUNT, secret)
    if (kept) writeFileSync(secretFile, secret)
    console.log(`Built in ${((Date.now() - buildStarted) / 1000).toFixed(0)} s.`)
  }

  const port = await freePort()
  const base = `http://127.0.0.1:${port}`
  const server = spawn(process.execPath, [join(root, '.output/server/index.mjs')], {
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      NUXT_DB_PATH: databasePath,
      NUXT_SESSION_PASSWORD: secret,
      NUXT_UPLOADS_DIR: join(folder, 'uploads'),
      NUXT_FAKE_SMTP: 'fake',
      NUXT_FAKE_SMTP_PORT: String(await freePort()),
    },
    stdio: ['ignore', 'inherit', 'inherit'],
  })
  try {
    for (let tries = 0; ; tries++) {
      const ok = await fetch(`${base}/api/health`).then(
        response => response.ok,
        () => false,
      )
      if (ok) break
      if (tries > 300) throw new Error('The server did not start.')
      await pause(100)
    }
    const login = async (email: string) => {
      const response = await fetch(`${base}/api/auth/login`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email, password: 'chargewell-demo' }),
      })
      return response.headers
        .getSetCookie()
        .map(line => line.split(';')[0])
        .join('; ')
    }
    const inspector = await login('inspector@chargewell.test')
    const get = async (path: string) => {
      const started = performance.now()
      const response = await fetch(`${base}${path}`, { headers: { cookie: inspector } })
      const body = await response.text()
      if (!response.ok) throw new Error(`${path} → ${response.status}: ${body.slice(0, 300)}`)
      return { ms: performance.now() - started, body }
    }
    const rows: [string, number, number][] = []
    const phases: [string, number][] = []
    const loopNow = async () =>
      (JSON.parse((await get('/api/health')).body).eventLoop?.windows ?? []) as { endedAt: string, maxMs: number }[]
    /**
     * The server's longest event-loop delay since `from`: read once the server has closed the window
     * (five seconds) that holds the last request made, asked for every quarter second until it has.
     */
    const longestDelaySince = async (from: string): Promise<number> => {
      const lastRequest = new Date().toISOString()
      for (;;) {
        const windows = await loopNow()
        if (windows.some(window => window.endedAt > lastRequest))
          return Math.max(0, ...windows.filter(window => window.endedAt > from).map(window => window.maxMs))
        await pause(250)
      }
    }
    const phase = async <T>(name: string, work: () => Promise<T>): Promise<T> => {
      const from = new Date().toISOString()
      const result = await work()
      phases.push([name, await longestDelaySince(from)])
      return result
    }
    const time = async (label: string, path: string | (() => string), repeats = REPEATS) => {
      await get(typeof path === 'string' ? path : path()) // warm
      const times: number[] = []
      for (let index = 0; index < repeats; index++) times.push((await get(typeof path === 'string' ? path : path())).ms)
      rows.push([label, percentile(times, 0.5), percentile(times, 0.95)])
      return times
    }

    // Each route's and page's first request loads and compiles its code (Nitro loads handlers lazily):
    // that blocks the event loop once per server start (up to about 70 ms for a page). Read apart, once the
    // window holding it has closed, so the run's own figure is the steady state.
    const coldFrom = new Date().toISOString()
    const warmUp = ['/api/worksheets?pageSize=25', '/api/worksheets?pageSize=25&q=qx', '/api/worksheets/1',
      '/api/trends/precharge', '/api/trends/cycles', '/trends', '/charge-target', '/worksheets',
      '/api/worksheets/export?state=voided']
    for (const path of warmUp) await get(path)
    const cold = await longestDelaySince(coldFrom)
    const measuringFrom = new Date().toISOString()
    const first = JSON.parse((await get('/api/worksheets?pageSize=25')).body)
    // A page deep in the list (about 90 % down, at most 500 pages of 25 on), by the cursor the list hands out.
    const deepPages = Math.max(1, Math.min(499, Math.floor((COUNT * 0.9) / 25)))
    let deepCursor = first.next as string | undefined
    const deepPath = () =>
      deepCursor
        ? `/api/worksheets?pageSize=25&cursor=${encodeURIComponent(deepCursor)}`
        : '/api/worksheets?pageSize=25'
    for (let page = 1; page < deepPages && deepCursor; page++) {
      const next = JSON.parse(
        (await get(`/api/worksheets?pageSize=25&cursor=${encodeURIComponent(deepCursor)}`)).body,
      ).next as string | null
      if (!next) break
      deepCursor = next
    }
    const tenth = Math.max(1, Math.round(COUNT / 10))
    const farPrefix = `wo-h-${String(9 * tenth).padStart(7, '0').slice(0, 7 - Math.round(Math.log10(tenth)))}`
    const list = await phase('lists', async () => [
      ...(await time('list, first page', '/api/worksheets?pageSize=25')),
      ...(await time(`list, page ${deepPages}`, deepPath)),
      ...(await time('list, sorted by work order', '/api/worksheets?pageSize=25&sort=workOrder&direction=asc')),
      ...(await time('list, searched (one work order)', '/api/worksheets?pageSize=25&q=WO-H-012345')),
      ...(await time('list, searched (a registration)', '/api/worksheets?pageSize=25&q=qx-fmc')),
      // About a tenth of the list, all of it at the far end of the order (the oldest work orders).
      ...(await time('list, searched (10 % of rows, at the far end)', `/api/worksheets?pageSize=25&q=${farPrefix}`)),
      ...(await time(
        'list, filtered (released, one aircraft)',
        '/api/worksheets?pageSize=25&state=released&aircraftId=3',
      )),
    ])
    const ids = Array.from({ length: REPEATS + 1 }, () => 1 + Math.floor(Math.random() * COUNT))
    let next = 0
    const record = await phase('records', async () => {
      const times = await time('one worksheet record', () => `/api/worksheets/${ids[next++ % ids.length]}`)
      await time(
        'countersign queue',
        '/api/worksheets?state=awaiting-countersign&sort=createdAt&direction=asc&pageSize=200',
      )
      return times
    })
    const trends = await phase('trends', async () => [
      ...(await time('trends, pre-charge', '/api/trends/precharge', Math.min(20, REPEATS))),
      ...(await time('trends, pump cycles', '/api/trends/cycles', Math.min(20, REPEATS))),
    ])
    // The pages people open, rendered by the server (HTML with its data).
    const pages = await phase('pages', async () => [
      ...(await time('page: Trends', '/trends', Math.min(20, REPEATS))),
      ...(await time('page: Charge target', '/charge-target', Math.min(20, REPEATS))),
      ...(await time('page: Worksheets', '/worksheets', Math.min(20, REPEATS))),
    ])

    const rssBefore = rssOf(server.pid!)
    let peak = rssBefore
    const sampler = setInterval(() => {
      peak = Math.max(peak, rssOf(server.pid!))
    }, 20)
    const exported = await phase('export', () => get('/api/worksheets/export'))
    const exportSeconds = exported.ms / 1000
    clearInterval(sampler)
    const exportedRows = exported.body.trimEnd().split('\n').length - 1

    const cannon = (options: autocannon.Options) =>
      new Promise<autocannon.Result>((done, fail) =>
        autocannon(options, (error: Error | null, result: autocannon.Result) => (error ? fail(error) : done(result))),
      )
    const healthLoad = await cannon({ url: `${base}/api/health`, connections: 10, duration: 5 })
    const calc = await cannon({
      url: `${base}/api/calc/charge-target`,
      connections: 10,
      duration: 5,
      method: 'POST',
      headers: { 'content-type': 'application/json', 'cookie': inspector },
      body: JSON.stringify({
        reference: { pressure: { value: 1000, unit: 'psi', basis: 'gauge' }, temperature: { value: 21, unit: 'C' } },
        gasTemperature: { value: -10, unit: 'C' },
        tolerance: { minus: 50, plus: 50, unit: 'psi' },
      }),
    })
    // The worst event-loop delay in the windows that ended while the requests above ran.
    const loopDelay = await longestDelaySince(measuringFrom)

    console.log(`\nChargewell at ${COUNT} worksheets (${REPEATS} sequential requests each; 2-core machine):\n`)
    console.log('| request | p50 ms | p95 ms |\n|---|---|---|')
    for (const [label, p50, p95] of rows) console.log(`| ${label} | ${p50.toFixed(1)} | ${p95.toFixed(1)} |`)
    console.log(
      `\nexport: ${exportedRows} rows of ${COUNT} in ${exportSeconds.toFixed(2)} s; server RSS ${rssBefore.toFixed(0)} MB before, peak ${peak.toFixed(0)} MB (+${(peak - rssBefore).toFixed(0)} MB)`,
    )
    console.log(
      `throughput: /api/health ${healthLoad.requests.average.toFixed(0)} req/s, /api/calc/charge-target ${calc.requests.average.toFixed(0)} req/s (${(calc.requests.average / healthLoad.requests.average).toFixed(2)}×); non-2xx ${healthLoad.non2xx + calc.non2xx}`,
    )
    console.log(
      `event loop: longest delay while measuring ${loopDelay} ms; per phase: ${phases.map(([name, ms]) => `${name} ${ms} ms`).join(', ')}; first requests after start (code loading) ${cold} ms`,
    )
    console.log(
      `scale: list p95 ${percentile(list, 0.95).toFixed(0)} ms; record p95 ${percentile(record, 0.95).toFixed(0)} ms; trends p95 ${percentile(trends, 0.95).toFixed(0)} ms; pages p95 ${percentile(pages, 0.95).toFixed(0)} ms; export ${exportSeconds.toFixed(1)} s`,
    )
    return rows
  }
  finally {
    server.kill('SIGTERM')
    rmSync(folder, { recursive: true, force: true })
    if (kept) console.log(`Kept the database at ${kept} for the next run.`)
  }
}

main().catch((error) => {
  console.error(error)
  process.exit(1)
})
