// A private Redis for scale-out (npm run cluster, the cluster tests): Debian's redis-server, no
// system service, data under .data/redis-<port>/, listening on loopback only. Plain Node, like db.mjs.
import { execFile, spawn } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync } from 'node:fs'
import { connect } from 'node:net'
import { resolve } from 'node:path'
import { promisify } from 'node:util'

const run = promisify(execFile)
const root = resolve(import.meta.dirname, '..')
const log = (msg) => console.log(`[redis] ${msg}`)

/** 6380, not Redis's usual 6379: a system Redis on the machine is left alone. */
export const redisDefaults = { port: Number(process.env.REDIS_PORT ?? 6380) }
export const redisDataDir = (port) => resolve(root, `.data/redis-${port}`)

/** Finds an executable on PATH or in the sbin folders Debian uses. */
export function findBinary(name) {
  for (const dir of (process.env.PATH ?? '').split(':').concat('/usr/sbin', '/usr/bin')) {
    const path = resolve(dir || '.', name)
    if (existsSync(path)) return path
  }
  return null
}

/** Installs a Debian package when its binary is missing (needs root), as db.mjs does for MariaDB. */
export async function ensurePackage(binary, pkg, tag = pkg) {
  if (findBinary(binary)) return findBinary(binary)
  console.log(`[${tag}] ${binary} not found: installing ${pkg} from Debian (needs root)`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  await run('apt-get', ['update'], { maxBuffer: 64 << 20, env })
  await run('apt-get', ['install', '-y', '--no-install-recommends', pkg], { maxBuffer: 64 << 20, env })
  const path = findBinary(binary)
  if (!path) throw new Error(`${pkg} installed but ${binary} is still missing`)
  return path
}

/** Sends PING over RESP; resolves true on +PONG. */
export function pingRedis(port, timeoutMs = 500) {
  return new Promise((done) => {
    const socket = connect({ host: '127.0.0.1', port })
    const finish = (ok) => {
      socket.destroy()
      done(ok)
    }
    socket.setTimeout(timeoutMs, () => finish(false))
    socket.once('error', () => finish(false))
    socket.once('connect', () => socket.write('PING\r\n'))
    socket.once('data', (chunk) => finish(chunk.toString().startsWith('+PONG')))
  })
}

const pidPath = (dataDir) => resolve(dataDir, 'redis.pid')
const alive = (pid) => {
  try {
    process.kill(pid, 0)
    return true
  } catch {
    return false
  }
}
const readPid = (dataDir) => {
  try {
    const pid = Number(readFileSync(pidPath(dataDir), 'utf8').trim())
    return Number.isInteger(pid) && pid > 0 ? pid : null
  } catch {
    return null
  }
}

/**
 * Starts (or reuses) our Redis on 127.0.0.1:port. Append-only file on (fsync every second): queued
 * solve jobs and room ownership survive a restart; no RDB snapshots. Returns { port, url, started, pid }.
 */
export async function startRedis(options = {}) {
  const port = options.port ?? redisDefaults.port
  const dataDir = options.dataDir ?? redisDataDir(port)
  const binary = await ensurePackage('redis-server', 'redis-server', 'redis')
  const url = `redis://127.0.0.1:${port}`
  const running = readPid(dataDir)
  if (running && alive(running) && (await pingRedis(port))) {
    log(`reusing Redis pid ${running} on port ${port}`)
    return { port, url, started: false, pid: running, dataDir }
  }
  mkdirSync(dataDir, { recursive: true })
  const child = spawn(
    binary,
    [
      '--port',
      String(port),
      '--bind',
      '127.0.0.1',
      '--protected-mode',
      'yes',
      '--dir',
      dataDir,
      '--save',
      '',
      '--appendonly',
      'yes',
      '--appendfsync',
      'everysec',
      '--pidfile',
      pidPath(dataDir),
      '--logfile',
      resolve(dataDir, 'redis.log'),
      '--daemonize',
      'no',
    ],
    { detached: true, stdio: 'ignore' },
  )
  child.unref()
  await waitFor(() => pingRedis(port), 15_000, `Redis did not answer on port ${port}; see ${dataDir}/redis.log`)
  log(`Redis started on 127.0.0.1:${port} (pid ${child.pid})`)
  return { port, url, started: true, pid: child.pid, dataDir }
}

/** Stops the Redis whose pid file is in the data folder (SIGTERM: it writes its AOF and exits). */
export async function stopRedis(options = {}) {
  const port = options.port ?? redisDefaults.port
  const dataDir = options.dataDir ?? redisDataDir(port)
  const pid = readPid(dataDir)
  if (!pid || !alive(pid)) return
  process.kill(pid, 'SIGTERM')
  await waitFor(async () => !alive(pid), 15_000, `Redis pid ${pid} did not stop`)
  log(`Redis pid ${pid} stopped`)
}

export async function waitFor(check, ms, message) {
  const end = Date.now() + ms
  while (Date.now() < end) {
    if (await check()) return
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(message)
}

// `node scripts/redis.mjs start|stop` for manual use.
if (import.meta.url === `file://${process.argv[1]}`) {
  const cmd = process.argv[2]
  if (cmd === 'start') await startRedis()
  else if (cmd === 'stop') await stopRedis()
  else console.log('usage: node scripts/redis.mjs start|stop')
}
