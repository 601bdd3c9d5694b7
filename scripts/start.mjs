// `npm start`: one command from a fresh clone to a running Veilroom on http://127.0.0.1:3210.
// Installs dependencies if missing, starts our MariaDB, applies migrations and the demo seed,
// builds the client when it is out of date, then runs the server until Ctrl-C / SIGTERM.
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { dbDefaults, startDb, stopDb } from './db.mjs'
import { clientBuildIsStale, hasClientSources, root, run, startServerChild, stopChild } from './helpers.mjs'
import { startFakeSmtpChild } from '../server/mail/fake-smtp-child.mjs'

const fail = (msg) => {
  console.error(`[start] ${msg}`)
  process.exit(1)
}

if (!existsSync(resolve(root, 'node_modules'))) {
  if (await run('npm', ['ci'])) fail('npm ci failed')
}

const db = await startDb()
const stopDbIfOurs = () => (db.started ? stopDb() : Promise.resolve())
const env = { ...process.env, DB_PORT: String(dbDefaults.port) }

if (await run('tsx', ['scripts/migrate.ts', '--seed'], { env })) {
  await stopDbIfOurs()
  fail('migrations or seed failed (see above)')
}

if (hasClientSources() && clientBuildIsStale()) {
  console.log('[start] building the client (vite build)…')
  if (await run('vite', ['build']))
    console.error('[start] client build failed: the API still starts, the web pages will not')
}

// Outside production, invites go to the fake SMTP server unless a real one is configured.
let smtp = null
if (process.env.NODE_ENV !== 'production' && !process.env.SMTP_HOST) {
  try {
    smtp = await startFakeSmtpChild({ ...env, SMTP_PORT: process.env.SMTP_PORT ?? '2525' })
    env.SMTP_PORT = String(smtp.port)
    console.log(`[start] fake SMTP server on 127.0.0.1:${smtp.port}; mail shows at /api/dev/mailbox`)
  } catch (err) {
    console.error(`[start] ${err.message}: invites cannot be mailed`)
  }
}

let server
try {
  server = await startServerChild(env)
} catch (err) {
  await stopDbIfOurs()
  fail(err.message)
}

// The seed module is the one list of demo accounts; tsx loads it without a build step.
const { tsImport } = await import('tsx/esm/api')
const { demoAccounts } = await tsImport('../server/db/seed.ts', import.meta.url)
const { cautionLines } = await tsImport('../shared/protocol/caution.ts', import.meta.url)
console.log(`
  Veilroom is running at ${process.env.PUBLIC_URL ?? server.url}

  Demo practice "Demo Tensile Studio" (fictional); sign in as:
${demoAccounts.map((a) => `    ${a.email.padEnd(30)} ${a.password.padEnd(22)} ${a.role}`).join('\n')}

${cautionLines('  ').trimEnd()}
  Ctrl-C stops the server and the database.
`)

let stopping = false
async function shutdown(signal) {
  if (stopping) return
  stopping = true
  console.log(`\n[start] ${signal}: stopping server and database…`)
  await stopChild(server.child)
  await stopChild(smtp?.child)
  await stopDbIfOurs()
  process.exit(0)
}
process.on('SIGINT', () => shutdown('SIGINT'))
process.on('SIGTERM', () => shutdown('SIGTERM'))
server.child.on('exit', async (code) => {
  if (stopping) return
  console.error(`[start] server exited (code ${code}); stopping the database`)
  await stopChild(smtp?.child)
  await stopDbIfOurs()
  process.exit(code || 1)
})
