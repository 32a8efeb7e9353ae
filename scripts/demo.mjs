// `npm run demo`: build, migrate, seed and start Chargewell on http://localhost:3000 (or $PORT).
// A session password is generated once into the git-ignored .env when none is set.
import { execFileSync, spawn } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, readFileSync, writeFileSync } from 'node:fs'

const env = { ...process.env }
if (existsSync('.env')) {
  for (const line of readFileSync('.env', 'utf8').split('\n')) {
    const match = line.match(/^\s*([A-Z_][A-Z0-9_]*)\s*=\s*(.*)\s*$/)
    if (match && env[match[1]] === undefined) env[match[1]] = match[2].replace(/^['"]|['"]$/g, '')
  }
}
if (!env.NUXT_SESSION_PASSWORD) {
  env.NUXT_SESSION_PASSWORD = randomBytes(32).toString('hex')
  writeFileSync('.env', `${existsSync('.env') ? readFileSync('.env', 'utf8').trimEnd() + '\n' : ''}NUXT_SESSION_PASSWORD=${env.NUXT_SESSION_PASSWORD}\n`)
  console.log('Generated a session password into .env (git-ignored).')
}
// The demo runs on this machine: its labels may open localhost (a production server refuses them).
env.NUXT_ALLOW_LOOPBACK_LABELS ??= 'true'
env.NUXT_OPERATOR_NAME ??= 'Fellmoor Regional'
env.NUXT_STATION_NAME ??= 'Fellmoor main base'
env.NUXT_FAKE_SMTP ??= env.NUXT_SMTP_URL ? '' : 'fake'

const run = (command, args) => execFileSync(command, args, { stdio: 'inherit', env })
run('npx', ['nuxt', 'build'])
run(process.execPath, ['scripts/task.mjs', 'db:seed'])
const port = env.PORT ?? '3000'
console.log(`\nChargewell is starting on http://localhost:${port} — demo accounts in README.md (password chargewell-demo).\n`)
const server = spawn(process.execPath, ['.output/server/index.mjs'], { stdio: 'inherit', env: { ...env, PORT: port, NODE_ENV: 'production' } })
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal))
server.on('exit', code => process.exit(code ?? 0))
