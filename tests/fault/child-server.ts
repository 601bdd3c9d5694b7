/**
 * The server as a real child process (`tsx server/main.ts`, scripts/helpers.mjs startServerChild)
 * so a test can kill -9 it, plus a private MariaDB instance (scripts/db.mjs) that a test may stop
 * and start without disturbing the shared test instance other engineers' runs use.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { resolve } from 'node:path'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
// @ts-expect-error plain .mjs helpers without type declarations
import { startDb, stopDb } from '../../scripts/db.mjs'

const root = resolve(import.meta.dirname, '../..')

export interface Child {
  child: ChildProcess
  url: string
  port: number
}

/** A free TCP port on loopback (asked of the OS, then released). */
export function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number }
      probe.close(() => resolvePort(port))
    })
  })
}

/** The test database's environment (as scripts/test.mjs sets it), with overrides. */
export function testEnv(extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'warn', ...extra }
  if (!String(env.DB_NAME ?? '').startsWith('veilroom_test_'))
    throw new Error('run through `npm test` (needs a veilroom_test_ database)')
  return env
}

/**
 * Starts the server on `port` (0 = any) and waits until it listens. Node itself with tsx's loader,
 * not the tsx binary: tsx runs the script in a grandchild, which a SIGKILL of tsx would orphan.
 */
export function startChild(env: NodeJS.ProcessEnv, port = 0, timeoutMs = 60_000): Promise<Child> {
  return new Promise((done, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
      cwd: root,
      env: { ...env, PORT: String(port), LOG_LEVEL: 'info', SOLVE_WORKERS: '1' },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let out = ''
    const timer = setTimeout(
      () => (child.kill('SIGKILL'), reject(new Error(`server did not listen within ${timeoutMs / 1000} s`))),
      timeoutMs,
    )
    const onData = (chunk: Buffer) => {
      out += chunk.toString()
      const match = /listening on (http:\/\/\S+)/.exec(out)
      if (!match) return
      clearTimeout(timer)
      child.stdout!.off('data', onData)
      // Keep draining its output so a chatty server never blocks on a full pipe.
      child.stdout!.resume()
      done({ child, url: match[1]!, port: Number(new URL(match[1]!).port) })
    }
    child.stdout!.on('data', onData)
    child.once(
      'exit',
      (code) => (
        clearTimeout(timer),
        reject(new Error(`server exited (${code}) before listening: ${out.slice(-500)}`))
      ),
    )
  })
}

/** kill -9, and wait for the exit. */
export function killHard(c: Child): Promise<void> {
  return new Promise((done) => {
    if (c.child.exitCode !== null || c.child.signalCode !== null) return done()
    c.child.once('exit', () => done())
    c.child.kill('SIGKILL')
  })
}

export interface PrivateDb {
  env: NodeJS.ProcessEnv
  stop: () => Promise<void>
  start: () => Promise<void>
  /** Stops the instance and deletes its data folder. */
  destroy: () => Promise<void>
}

/** A MariaDB of our own on a free port, migrated; `stop` and `start` keep its data. */
export async function privateDb(): Promise<PrivateDb> {
  const port = await freePort()
  const db = {
    port,
    dataDir: resolve(import.meta.dirname, `../../.data/mariadb-fault-${port}`),
    database: 'veilroom_test_fault',
    user: 'veilroom',
    password: 'veilroom-fault-password',
  }
  await startDb(db)
  const env = testEnv({ DB_PORT: String(port), DB_NAME: db.database, DB_USER: db.user, DB_PASSWORD: db.password })
  const ds = createDataSource(loadConfig(env))
  await ds.initialize()
  await ds.runMigrations({ transaction: 'each' })
  await ds.destroy()
  return {
    env,
    stop: () => stopDb(db),
    start: async () => void (await startDb(db)),
    destroy: async () => {
      await stopDb(db)
      rmSync(db.dataDir, { recursive: true, force: true })
    },
  }
}
