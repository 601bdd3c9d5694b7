// A private MariaDB instance for development and tests: no system service, data under .data/,
// listening on loopback only. Plain Node so it runs before dependencies are type-checked.
import { spawn, execFile } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { promisify } from 'node:util'

const run = promisify(execFile)
const root = resolve(import.meta.dirname, '..')

/** Defaults match server/config.ts so the server finds the database without any .env. */
export const dbDefaults = {
  port: Number(process.env.DB_PORT ?? 3307),
  dataDir: resolve(root, '.data/mariadb'),
  database: process.env.DB_NAME ?? 'veilroom',
  user: process.env.DB_USER ?? 'veilroom',
  password: process.env.DB_PASSWORD ?? 'veilroom-dev-password',
}

const log = (msg) => console.log(`[db] ${msg}`)

async function findBinary(name) {
  for (const dir of (process.env.PATH ?? '').split(':').concat('/usr/sbin', '/usr/bin')) {
    const path = resolve(dir || '.', name)
    if (existsSync(path)) return path
  }
  return null
}

async function ensureInstalled() {
  if (await findBinary('mariadbd')) return
  log('mariadbd not found: installing mariadb-server from Debian (needs root)')
  await run('apt-get', ['update'], { maxBuffer: 64 << 20 })
  await run('apt-get', ['install', '-y', 'mariadb-server'], {
    maxBuffer: 64 << 20,
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  })
  if (!(await findBinary('mariadbd'))) throw new Error('mariadb-server installed but mariadbd is still missing')
}

// The data dir can sit on a long path; unix sockets are limited to ~107 bytes, so keep it in /tmp.
const socketPath = (port) => `/tmp/veilroom-${port}.sock`
const pidPath = (dataDir) => resolve(dataDir, 'mariadbd.pid')

function alive(pid) {
  try {
    process.kill(pid, 0)
    return true
  } catch {
    return false
  }
}

function readPid(dataDir) {
  try {
    const pid = Number(readFileSync(pidPath(dataDir), 'utf8').trim())
    return Number.isInteger(pid) && pid > 0 ? pid : null
  } catch {
    return null
  }
}

async function ping(port) {
  try {
    await run('mariadb-admin', ['--no-defaults', `--socket=${socketPath(port)}`, '-uroot', 'ping'])
    return true
  } catch {
    return false
  }
}

/** Runs SQL as root over the private socket. Values must be escaped by the caller (sqlString). */
export async function rootSql(port, sql) {
  const { stdout } = await run('mariadb', ['--no-defaults', `--socket=${socketPath(port)}`, '-uroot', '-N', '-e', sql])
  return stdout
}

/** Quotes a string literal for the few statements above that cannot take bound parameters. */
export const sqlString = (s) => `'${String(s).replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`
const ident = (s) => {
  if (!/^[A-Za-z0-9_]+$/.test(s)) throw new Error(`database name "${s}": only letters, digits and _`)
  return `\`${s}\``
}

/** Creates the database (if missing) and grants the app user all rights on it. */
export async function createDatabase({ port, database, user, password }) {
  // mariadb-install-db adds anonymous ''@localhost users, which would shadow our user@'%'.
  const anonymous = (await rootSql(port, "SELECT Host FROM mysql.user WHERE User = ''")).split('\n').filter(Boolean)
  for (const host of anonymous) await rootSql(port, `DROP USER ''@${sqlString(host)}`)
  await rootSql(
    port,
    `CREATE DATABASE IF NOT EXISTS ${ident(database)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
     CREATE USER IF NOT EXISTS ${sqlString(user)}@'%' IDENTIFIED BY ${sqlString(password)};
     ALTER USER ${sqlString(user)}@'%' IDENTIFIED BY ${sqlString(password)};
     GRANT ALL PRIVILEGES ON ${ident(database)}.* TO ${sqlString(user)}@'%';`,
  )
}

export async function dropDatabase({ port, database }) {
  await rootSql(port, `DROP DATABASE IF EXISTS ${ident(database)}`)
}

/**
 * Starts (or reuses) our MariaDB on 127.0.0.1:port and makes sure the database and user exist.
 * Returns { port, socket, started } — started is false when an instance of ours was already running.
 */
export async function startDb(options = {}) {
  const opts = { ...dbDefaults, ...options }
  const { port, dataDir } = opts
  await ensureInstalled()
  const pid = readPid(dataDir)
  let started = false
  if (pid && alive(pid) && (await ping(port))) {
    log(`reusing MariaDB pid ${pid} on port ${port}`)
  } else {
    mkdirSync(dataDir, { recursive: true })
    if (!existsSync(resolve(dataDir, 'mysql'))) {
      log(`initialising ${dataDir}`)
      await run(
        'mariadb-install-db',
        ['--no-defaults', `--datadir=${dataDir}`, '--user=root', '--auth-root-authentication-method=normal'],
        { maxBuffer: 64 << 20 },
      )
    }
    const child = spawn(
      await findBinary('mariadbd'),
      [
        '--no-defaults',
        `--datadir=${dataDir}`,
        `--socket=${socketPath(port)}`,
        `--port=${port}`,
        '--bind-address=127.0.0.1',
        '--user=root',
        `--pid-file=${pidPath(dataDir)}`,
        // The app reads and writes DATETIME as UTC (mysql2 timezone 'Z'); column defaults must agree.
        '--default-time-zone=+00:00',
        // Flush the redo log once a second instead of at every commit: a crash of the server or of
        // mariadbd still loses nothing (the log is in the OS cache); only a power loss may lose the
        // last second. Every edit is one insert, and the per-commit disk flush dominated its latency.
        '--innodb-flush-log-at-trx-commit=2',
        `--log-error=${resolve(dataDir, 'error.log')}`,
      ],
      { detached: true, stdio: 'ignore' },
    )
    child.unref()
    started = true
    await waitFor(() => ping(port), 30_000, `MariaDB did not answer on port ${port}; see ${dataDir}/error.log`)
    log(`MariaDB started on 127.0.0.1:${port} (pid ${child.pid})`)
  }
  await createDatabase(opts)
  return { port, socket: socketPath(port), started }
}

/** Stops the instance whose pid file lives in dataDir and waits until the process has exited. */
export async function stopDb(options = {}) {
  const { dataDir } = { ...dbDefaults, ...options }
  const pid = readPid(dataDir)
  if (!pid || !alive(pid)) return
  process.kill(pid, 'SIGTERM')
  await waitFor(async () => !alive(pid), 30_000, `MariaDB pid ${pid} did not stop`)
  log(`MariaDB pid ${pid} stopped`)
}

async function waitFor(check, ms, message) {
  const end = Date.now() + ms
  while (Date.now() < end) {
    if (await check()) return
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(message)
}

// `node scripts/db.mjs start|stop` for manual use.
if (import.meta.url === `file://${process.argv[1]}`) {
  const cmd = process.argv[2]
  if (cmd === 'start') await startDb()
  else if (cmd === 'stop') await stopDb()
  else console.log('usage: node scripts/db.mjs start|stop')
}
