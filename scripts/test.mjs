// `npm test`: typecheck, lint, then every vitest suite against a throwaway MariaDB database, then
// the browser tests against a running server. All stages run; the exit code is the first failure.
// `npm test -- <vitest filters…>` runs only the matching vitest files (no typecheck, lint, browser);
// `npm test -- --browser` only the browser tests; `npm test -- --browser <files…>` only those.
import { existsSync, readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { dbDefaults, dropDatabase, rootSql, startDb, stopDb } from './db.mjs'
import {
  clientBuildIsStale,
  hasClientSources,
  root,
  run,
  startServerChild,
  stopChild,
  stopRunning,
} from './helpers.mjs'
import { startFakeSmtpChild } from '../server/mail/fake-smtp-child.mjs'

// `npm test -- --browser` runs only the browser tests (with the database and server they need);
// filters given with it pick browser test files instead of vitest suites.
const browserOnly = process.argv.includes('--browser')
const filters = process.argv.slice(2).filter((a) => a !== '--browser')
const results = []
async function stage(name, fn) {
  const t0 = Date.now()
  console.log(`\n=== ${name}`)
  let code
  try {
    code = await fn()
  } catch (err) {
    console.error(err)
    code = 1
  }
  results.push({ name, code, s: ((Date.now() - t0) / 1000).toFixed(1) })
  return code
}

if (!existsSync(resolve(root, 'node_modules'))) await run('npm', ['ci'])

if (!filters.length && !browserOnly) {
  if (hasClientSources())
    await stage('typecheck client (vue-tsc --build)', () => run('vue-tsc', ['--build', '--force']))
  await stage('typecheck server (tsc -p tsconfig.server.json)', () =>
    run('tsc', ['--noEmit', '-p', 'tsconfig.server.json']),
  )
  // tests also reach into the DOM (client units, page.evaluate in browser tests); the server may not
  await stage('typecheck tests (tsc -p tsconfig.tests.json)', () =>
    run('tsc', ['--noEmit', '-p', 'tsconfig.tests.json']),
  )
  await stage('lint (eslint)', () => run('eslint', ['.']))
  await stage('format (prettier --check)', () => run('prettier', ['--check', '.']))
}

// A separate instance and a fresh database per run, so tests never see development data.
// TEST_DB_PORT lets two checkouts run their suites side by side on one machine
const testDbPort = Number(process.env.TEST_DB_PORT) || 3308
const db = { ...dbDefaults, port: testDbPort, dataDir: resolve(root, `.data/mariadb-test-${testDbPort}`) }
db.database = `veilroom_test_${new Date().toISOString().replace(/\D/g, '').slice(0, 14)}_${process.pid}`
const instance = await startDb(db)
const env = {
  ...process.env,
  NODE_ENV: 'test',
  LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
  BCRYPT_COST: process.env.BCRYPT_COST ?? '10',
  DB_HOST: '127.0.0.1',
  DB_PORT: String(db.port),
  DB_NAME: db.database,
  DB_USER: db.user,
  DB_PASSWORD: db.password,
}

let server = null
let smtp = null
let cleaning = null
/** Stops children, drops the database, maybe stops MariaDB; one shared promise so both exits wait. */
function cleanUp() {
  cleaning ??= (async () => {
    await stopRunning()
    await stopChild(server?.child)
    await stopChild(smtp?.child)
    await dropDatabase(db).catch((err) => console.error(`[db] could not drop ${db.database}: ${err.message}`))
    // Another engineer's run may share this instance: stop it only when no test database is left.
    const others = await rootSql(db.port, "SHOW DATABASES LIKE 'veilroom\\_test\\_%'").catch(() => '')
    if (instance.started && !others.trim()) await stopDb(db)
  })()
  return cleaning
}
// Ctrl-C or a CI timeout still stops the children and drops the throwaway database.
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.once(signal, () => cleanUp().finally(() => process.exit(130)))
}
try {
  const migrated = await stage('migrate + demo seed (test database)', () =>
    run('tsx', ['scripts/migrate.ts', '--seed'], { env }),
  )
  if (migrated === 0) {
    if (!browserOnly)
      await stage(`vitest ${filters.join(' ') || '(all tests/**)'}`, () => run('vitest', ['run', ...filters], { env }))
    const browserDir = resolve(root, 'tests/browser')
    const e2e = existsSync(browserDir) ? readdirSync(browserDir).filter((f) => f.endsWith('.e2e.ts')) : []
    if ((browserOnly || !filters.length) && e2e.length) {
      await stage('browser tests (chromium)', async () => {
        if (!existsSync('/usr/bin/chromium')) {
          if ((await run('apt-get', ['update'])) || (await run('apt-get', ['install', '-y', 'chromium']))) return 1
        }
        // The report test reads its printed PDFs back with pdftotext (Debian's poppler-utils).
        if (!existsSync('/usr/bin/pdftotext')) {
          if ((await run('apt-get', ['update'])) || (await run('apt-get', ['install', '-y', 'poppler-utils']))) return 1
        }
        if (clientBuildIsStale() && (await run('vite', ['build']))) return 1
        // Invite mail goes to a fake SMTP server on a free port, read back through /api/dev/mailbox.
        smtp = await startFakeSmtpChild({ ...env, SMTP_PORT: '0' })
        server = await startServerChild({ ...env, PORT: '0', SMTP_HOST: '127.0.0.1', SMTP_PORT: String(smtp.port) })
        return run('vitest', ['run', '--config', 'tests/browser/vitest.config.ts', ...filters], {
          env: { ...env, BASE_URL: server.url },
        })
      })
    }
  }
} finally {
  await cleanUp()
}

console.log('\n=== summary')
for (const r of results) console.log(`${r.code === 0 ? 'ok  ' : 'FAIL'} ${r.name} (${r.s} s)`)
const failed = results.find((r) => r.code !== 0)
process.exit(failed ? failed.code || 1 : 0)
