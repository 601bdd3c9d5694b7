/**
 * A scaled-out Veilroom on loopback for the cluster tests: a private Redis (scripts/redis.mjs), app
 * instances and solve workers as real child processes (so a test can kill -9 one) and HAProxy
 * (scripts/haproxy.mjs) in front, all against the suite's test database.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { rmSync } from 'node:fs'
import { resolve } from 'node:path'
import { freePort, killHard, startChild, testEnv, type Child } from '../fault/child-server.js'
// @ts-expect-error plain .mjs helpers without type declarations
import { startRedis, stopRedis } from '../../scripts/redis.mjs'
// @ts-expect-error plain .mjs helpers without type declarations
import { startHaproxy } from '../../scripts/haproxy.mjs'

const root = resolve(import.meta.dirname, '../..')
/** Four TypeScript processes booting at once on a loaded 2-core machine took over a minute. */
const BOOT_MS = 180_000

export interface Worker {
  id: string
  child: ChildProcess
}

export interface Cluster {
  proxyUrl: string
  instances: Record<'a' | 'b', Child>
  workers: Worker[]
  env: NodeJS.ProcessEnv
  stopRedis: () => Promise<void>
  startRedis: () => Promise<void>
  stop: () => Promise<void>
}

/** A worker process (node with tsx's loader, so kill -9 hits the process that solves). */
export function startWorker(env: NodeJS.ProcessEnv, id: string): Promise<Worker> {
  return new Promise((done, reject) => {
    const timer = setTimeout(
      () => (child.kill('SIGKILL'), reject(new Error(`worker ${id} not ready within ${BOOT_MS / 1000} s`))),
      BOOT_MS,
    )
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
      cwd: root,
      // A short job lock: a job of a killed worker is retried within seconds, not half a minute.
      env: { ...env, WORKER_ID: id, SOLVE_WORKERS: '1', SOLVE_LOCK_MS: '2000', LOG_LEVEL: 'info' },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let out = ''
    const onData = (chunk: Buffer) => {
      out += chunk.toString()
      if (!out.includes(`solve worker ${id} ready`)) return
      clearTimeout(timer)
      child.stdout!.off('data', onData)
      // From here on its log (jobs moved from a dead worker, reconnects) shows with the test output.
      child.stdout!.pipe(process.stdout)
      done({ id, child })
    }
    child.stdout!.on('data', onData)
    child.once(
      'exit',
      (code) => (
        clearTimeout(timer),
        reject(new Error(`worker ${id} exited (${code}) before ready: ${out.slice(-400)}`))
      ),
    )
  })
}

export async function startCluster(): Promise<Cluster> {
  const [redisPort, proxyPort, portA, portB] = [await freePort(), await freePort(), await freePort(), await freePort()]
  const dataDir = resolve(root, `.data/redis-test-${redisPort}`)
  const redis = await startRedis({ port: redisPort, dataDir })
  const proxyUrl = `http://127.0.0.1:${proxyPort}`
  const env = testEnv({ REDIS_URL: redis.url, PUBLIC_URL: proxyUrl })
  const started = await Promise.allSettled([
    startChild({ ...env, INSTANCE_ID: 'a' }, portA, BOOT_MS),
    startChild({ ...env, INSTANCE_ID: 'b' }, portB, BOOT_MS),
    startWorker(env, 'w1'),
    startWorker(env, 'w2'),
  ])
  const failed = started.find((r) => r.status === 'rejected')
  if (failed) {
    // Leave nothing running behind a failed start.
    for (const r of started) if (r.status === 'fulfilled') r.value.child.kill('SIGKILL')
    await stopRedis({ port: redisPort, dataDir })
    rmSync(dataDir, { recursive: true, force: true })
    throw failed.reason
  }
  const [a, b] = started.slice(0, 2).map((r) => (r as PromiseFulfilledResult<Child>).value) as [Child, Child]
  const [w1, w2] = started.slice(2).map((r) => (r as PromiseFulfilledResult<Worker>).value) as [Worker, Worker]
  const proxy = await startHaproxy({
    port: proxyPort,
    instances: [
      { name: 'a', port: portA },
      { name: 'b', port: portB },
    ],
  })
  const workers = [w1, w2]
  return {
    proxyUrl,
    instances: { a, b },
    workers,
    env,
    stopRedis: () => stopRedis({ port: redisPort, dataDir }),
    startRedis: async () => void (await startRedis({ port: redisPort, dataDir })),
    stop: async () => {
      proxy.child.kill('SIGKILL')
      rmSync(proxy.file, { force: true })
      await Promise.all([
        killHard(a),
        killHard(b),
        ...workers.map((w) => killHard({ child: w.child, url: '', port: 0 })),
      ])
      await stopRedis({ port: redisPort, dataDir })
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
