// A private MariaDB instance for development and tests: no system service, data under .data/,
// listening on loopback only. Plain Node so it runs before dependencies are type-checked.
import { execFile } from 'node:child_process'
import { existsSync, mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { promisify } from 'node:util'
import { alive, ensurePackage, readPid, startDaemon, stopDaemon } from './helpers.mjs'

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

// The data dir can sit on a long path; unix sockets are limited to ~107 bytes, so keep it in /tmp.
const socketPath = (port) => `/tmp/veilroom-${port}.sock`
const pidPath = (dataDir) => resolve(dataDir, 'mariadbd.pid')

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
  const mariadbd = await ensurePackage('mariadbd', 'mariadb-server', { tag: 'db', recommends: true })
  const pid = readPid(pidPath(dataDir))
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
    const daemon = await startDaemon(
      mariadbd,
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
      { ready: () => ping(port), ms: 30_000, what: `MariaDB did not answer on port ${port}; see ${dataDir}/error.log` },
    )
    started = true
    log(`MariaDB started on 127.0.0.1:${port} (pid ${daemon})`)
  }
  await createDatabase(opts)
  return { port, socket: socketPath(port), started }
}

/** Stops the instance whose pid file lives in dataDir and waits until the process has exited. */
export async function stopDb(options = {}) {
  const { dataDir } = { ...dbDefaults, ...options }
  await stopDaemon(pidPath(dataDir), 30_000, 'MariaDB', log)
}

// `node scripts/db.mjs start|stop` for manual use.
if (import.meta.url === `file://${process.argv[1]}`) {
  const cmd = process.argv[2]
  if (cmd === 'start') await startDb()
  else if (cmd === 'stop') await stopDb()
  else console.log('usage: node scripts/db.mjs start|stop')
}
