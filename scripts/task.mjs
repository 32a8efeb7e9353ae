// `node scripts/task.mjs db:seed`: runs a Nitro task (server/tasks) in the built server and exits.
// Builds first when there is no build. The environment is the process's own, then the git-ignored
// .env for what it lacks (as `npm run demo` writes it), so the task sees the secrets the server will.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync, readFileSync } from 'node:fs'

// Anything after the task's name goes to the task as CHARGEWELL_TASK_ARGS (`npm run backup -- --out /backups`).
const [name = 'db:seed', ...args] = process.argv.slice(2)
const env = { ...process.env, CHARGEWELL_TASK_ARGS: JSON.stringify(args) }
if (existsSync('.env')) {
  for (const line of readFileSync('.env', 'utf8').split('\n')) {
    const match = line.match(/^\s*([A-Z_][A-Z0-9_]*)\s*=\s*(.*?)\s*$/)
    if (match && env[match[1]] === undefined) env[match[1]] = match[2].replace(/^['"]|['"]$/g, '')
  }
}
// A restore opens the database it restores into (`--to`), never the configured one.
if (name === 'db:restore') {
  const to = args[args.indexOf('--to') + 1]
  if (!args.includes('--to') || !to) {
    console.error('Usage: npm run restore -- <backup folder> --to <new SQLite file | postgres:// URL of an empty database>')
    process.exit(2)
  }
  if (/^postgres(ql)?:\/\//.test(to)) Object.assign(env, { NUXT_DATABASE_URL: to, NUXT_DB_PATH: '' })
  else Object.assign(env, { NUXT_DB_PATH: to, NUXT_DATABASE_URL: '' })
}
const entry = env.CHARGEWELL_OUTPUT ? `${env.CHARGEWELL_OUTPUT}/server/index.mjs` : '.output/server/index.mjs'
if (!existsSync(entry)) execFileSync('npx', ['nuxt', 'build'], { stdio: 'inherit', env })
// Port 0: the server listens nowhere useful while the task runs, and clashes with nothing.
const run = spawnSync(process.execPath, [entry], { stdio: 'inherit', env: { ...env, CHARGEWELL_TASK: name, PORT: '0', HOST: '127.0.0.1', NODE_ENV: 'production' } })
process.exit(run.status ?? 1)
