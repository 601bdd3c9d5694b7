// `npm run cluster -- --instances N --workers M` (defaults 2 and 2): Veilroom scaled out on one
// machine. MariaDB (as npm start), a private Redis, N app instances on PORT+1 … PORT+N, M solve
// workers, and HAProxy on PORT (default 3210) in front, all on 127.0.0.1. Ctrl-C stops everything
// this script started.
import { spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { dbDefaults, startDb, stopDb } from './db.mjs'
import { startHaproxy } from './haproxy.mjs'
import { clientBuildIsStale, hasClientSources, root, run, startServerChild, stopChild } from './helpers.mjs'
import { redisDefaults, startRedis, stopRedis } from './redis.mjs'
import { startFakeSmtpChild } from '../server/mail/fake-smtp-child.mjs'

const fail = (msg) => {
  console.error(`[cluster] ${msg}`)
  process.exit(1)
}
// `npm run cluster --instances 3` (without `--`) reaches us as npm config in the environment.
const { values } = parseArgs({
  options: {
    instances: { type: 'string', default: process.env.npm_config_instances ?? '2' },
    workers: { type: 'string', default: process.env.npm_config_workers ?? '2' },
  },
})
const count = (name, text) => {
  const n = Number(text)
  if (!Number.isInteger(n) || n < 1 || n > 16) fail(`--${name}: a whole number from 1 to 16, got "${text}"`)
  return n
}
const instances = count('instances', values.instances)
const workers = count('workers', values.workers)
const port = Number(process.env.PORT ?? 3210)
const publicUrl = process.env.PUBLIC_URL ?? `http://127.0.0.1:${port}`

if (!existsSync(resolve(root, 'node_modules')) && (await run('npm', ['ci']))) fail('npm ci failed')
const db = await startDb()
const redis = await startRedis({ port: redisDefaults.port })
const env = { ...process.env, DB_PORT: String(dbDefaults.port), REDIS_URL: redis.url, PUBLIC_URL: publicUrl }
const children = []
let smtp = null
let stopping = false

async function shutdown(code) {
  if (stopping) return
  stopping = true
  console.log('\n[cluster] stopping proxy, instances, workers, Redis and database…')
  await Promise.all(children.map((c) => stopChild(c)))
  await stopChild(smtp?.child)
  if (redis.started) await stopRedis({ port: redis.port })
  if (db.started) await stopDb()
  process.exit(code)
}
process.on('SIGINT', () => shutdown(0))
process.on('SIGTERM', () => shutdown(0))

try {
  if (await run('tsx', ['scripts/migrate.ts', '--seed'], { env }))
    throw new Error('migrations or seed failed (see above)')
  if (hasClientSources() && clientBuildIsStale()) {
    console.log('[cluster] building the client (vite build)…')
    if (await run('vite', ['build']))
      console.error('[cluster] client build failed: the API still starts, the web pages will not')
  }
  if (process.env.NODE_ENV !== 'production' && !process.env.SMTP_HOST) {
    smtp = await startFakeSmtpChild({ ...env, SMTP_PORT: process.env.SMTP_PORT ?? '2525' })
    env.SMTP_PORT = String(smtp.port)
  }
  const backends = Array.from({ length: instances }, (_, i) => ({ name: `app${i + 1}`, port: port + i + 1 }))
  const servers = await Promise.allSettled(
    backends.map((b) => startServerChild({ ...env, PORT: String(b.port), INSTANCE_ID: b.name })),
  )
  for (const s of servers) if (s.status === 'fulfilled') children.push(s.value.child)
  const failed = servers.find((s) => s.status === 'rejected')
  if (failed) throw failed.reason
  for (let i = 1; i <= workers; i++) {
    const child = spawn(resolve(root, 'node_modules/.bin/tsx'), ['server/worker.ts'], {
      cwd: root,
      env: { ...env, WORKER_ID: `solver${i}`, SOLVE_WORKERS: process.env.SOLVE_WORKERS ?? '1' },
      stdio: ['ignore', 'inherit', 'inherit'],
    })
    children.push(child)
  }
  const proxy = await startHaproxy({ port, instances: backends })
  children.unshift(proxy.child)
} catch (err) {
  console.error(`[cluster] ${err.message}`)
  await shutdown(1)
}
for (const child of children) {
  child.on('exit', (code, signal) => {
    if (!stopping) console.error(`[cluster] a child exited (${signal ?? code}); the rest keep running`)
  })
}
console.log(`
  Veilroom (scaled out) is running at ${publicUrl}
  HAProxy 127.0.0.1:${port} → ${instances} instance(s) on ${port + 1}…${port + instances}; ${workers} solve worker(s);
  Redis ${redis.url}; MariaDB 127.0.0.1:${dbDefaults.port}. Health of one instance: /api/health.
  Demo accounts as for npm start (README). Ctrl-C stops everything started here.
`)
