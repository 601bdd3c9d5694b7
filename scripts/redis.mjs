// A private Redis for scale-out (npm run cluster, the cluster tests): Debian's redis-server, no
// system service, data under .data/redis-<port>/, listening on loopback only. Plain Node, like db.mjs.
import { mkdirSync } from 'node:fs'
import { connect } from 'node:net'
import { resolve } from 'node:path'
import { alive, ensurePackage, readPid, startDaemon, stopDaemon } from './helpers.mjs'

const root = resolve(import.meta.dirname, '..')
const log = (msg) => console.log(`[redis] ${msg}`)

/** 6380, not Redis's usual 6379: a system Redis on the machine is left alone. */
export const redisDefaults = { port: Number(process.env.REDIS_PORT ?? 6380) }
export const redisDataDir = (port) => resolve(root, `.data/redis-${port}`)

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
/**
 * Starts (or reuses) our Redis on 127.0.0.1:port. Append-only file on (fsync every second): queued
 * solve jobs and room ownership survive a restart; no RDB snapshots. Returns { port, url, started, pid }.
 */
export async function startRedis(options = {}) {
  const port = options.port ?? redisDefaults.port
  const dataDir = options.dataDir ?? redisDataDir(port)
  const binary = await ensurePackage('redis-server', 'redis-server', { tag: 'redis' })
  const url = `redis://127.0.0.1:${port}`
  const running = readPid(pidPath(dataDir))
  if (running && alive(running) && (await pingRedis(port))) {
    log(`reusing Redis pid ${running} on port ${port}`)
    return { port, url, started: false, pid: running, dataDir }
  }
  mkdirSync(dataDir, { recursive: true })
  const pid = await startDaemon(
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
    {
      ready: () => pingRedis(port),
      ms: 15_000,
      what: `Redis did not answer on port ${port}; see ${dataDir}/redis.log`,
    },
  )
  log(`Redis started on 127.0.0.1:${port} (pid ${pid})`)
  return { port, url, started: true, pid, dataDir }
}

/** Stops the Redis whose pid file is in the data folder (SIGTERM: it writes its AOF and exits). */
export async function stopRedis(options = {}) {
  const port = options.port ?? redisDefaults.port
  await stopDaemon(pidPath(options.dataDir ?? redisDataDir(port)), 15_000, 'Redis', log)
}

// `node scripts/redis.mjs start|stop` for manual use.
if (import.meta.url === `file://${process.argv[1]}`) {
  const cmd = process.argv[2]
  if (cmd === 'start') await startRedis()
  else if (cmd === 'stop') await stopRedis()
  else console.log('usage: node scripts/redis.mjs start|stop')
}
