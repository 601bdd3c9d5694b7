/**
 * `npm run bench:scale -- --instances 1|2 [--workers 1|2]`: the scaled-out arrangement on loopback
 * (scripts/cluster.mjs's parts without the proxy: a private Redis, N instances and M solve workers
 * as child processes, a throwaway database on the development MariaDB). Two measurements:
 *
 * 1. Rooms × 10 editors (1, 5, 10 rooms) at edit → peer p99 against 100 ms, each room's editors
 *    spread over the instances (editor k on instance k mod N), so with N = 2 every relay half the
 *    time crosses Redis. The editors are bench-load.ts's client processes.
 * 2. Solve throughput: R rooms each edit, wait for the fine surface that includes the edit, edit
 *    again, for BENCH_SECONDS; solves/s with 1 worker, then with M (a worker is added).
 *
 * Prints the machine's load and a calibration loop beside the figures; writes
 * bench-results/scale-<N>.json. Env: BENCH_SECONDS (5), REDIS_PORT (6389), BENCH_SOLVE_ROOMS (6), BENCH_ROOMS
 * (the relay ladder, default 1,5,10).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync, rmSync, writeFileSync } from 'node:fs'
import { cpus, loadavg } from 'node:os'
import { resolve } from 'node:path'
import { parseArgs } from 'node:util'
import * as Y from 'yjs'

const root = resolve(import.meta.dirname, '..')
const SECONDS = Number(process.env.BENCH_SECONDS ?? 5)
const { values } = parseArgs({
  options: { instances: { type: 'string', default: '2' }, workers: { type: 'string', default: '2' } },
})
const N = Number(values.instances)
const M = Number(values.workers)
if (![1, 2, 3, 4].includes(N) || ![1, 2, 3, 4].includes(M)) throw new Error('--instances and --workers: 1 to 4')
const redisPort = Number(process.env.REDIS_PORT ?? 6389)
const solveRooms = Number(process.env.BENCH_SOLVE_ROOMS ?? 6)

// Plain-JS helpers without type declarations; specifiers as values so tsc does not look for them.
const [dbScript, redisScript, helpersScript] = ['./db.mjs', './redis.mjs', './helpers.mjs']
const dbm = (await import(dbScript)) as {
  startDb: () => Promise<{ port: number }>
  createDatabase: (o: Record<string, unknown>) => Promise<void>
  dropDatabase: (o: { port: number; database: string }) => Promise<void>
  dbDefaults: Record<string, unknown>
}
const rm = (await import(redisScript)) as {
  startRedis: (o: { port: number; dataDir: string }) => Promise<{ url: string }>
  stopRedis: (o: { port: number; dataDir: string }) => Promise<void>
}
const hm = (await import(helpersScript)) as {
  startServerChild: (env: NodeJS.ProcessEnv) => Promise<{ child: ChildProcess; url: string }>
  stopChild: (c: ChildProcess) => Promise<void>
}

const calibrationMs = () => {
  const a = new Float64Array(1e6)
  const t = performance.now()
  for (let r = 0; r < 100; r++) for (let i = 0; i < a.length; i++) a[i]! += i * 0.5
  return performance.now() - t
}
const calibrationBefore = calibrationMs()

const db = await dbm.startDb()
const database = `veilroom_bench_${Date.now()}`
await dbm.createDatabase({ ...dbm.dbDefaults, port: db.port, database })
const dataDir = resolve(root, `.data/redis-bench-${redisPort}`)
const redis = await rm.startRedis({ port: redisPort, dataDir })
const env: NodeJS.ProcessEnv = {
  ...process.env,
  DB_PORT: String(db.port),
  DB_NAME: database,
  NODE_ENV: 'development',
  LOG_LEVEL: 'warn',
  REDIS_URL: redis.url,
}
Object.assign(process.env, env)
const { loadConfig } = await import('../server/config.js')
const { createDataSource } = await import('../server/db/data-source.js')
const { makeRoom, makeUser, signIn, connectDoc, connectStream, until } =
  await import('../tests/realtime/live-helpers.js')
const { loopsOf } = await import('../shared/room-doc/schema.js')
const { movePoint, setSettings } = await import('../shared/room-doc/edits.js')
const ds = await createDataSource(loadConfig(env)).initialize()
await ds.runMigrations({ transaction: 'each' })

const children: ChildProcess[] = []
const startWorker = (id: string) => {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
    cwd: root,
    env: { ...env, WORKER_ID: id, SOLVE_WORKERS: '1' },
    stdio: 'ignore',
  })
  children.push(child)
  return child
}
const instances = await Promise.all(
  Array.from({ length: N }, (_, i) => hm.startServerChild({ ...env, PORT: '0', INSTANCE_ID: `bench${i + 1}` })),
)
children.push(...instances.map((s) => s.child))
const urls = instances.map((s) => s.url)
startWorker('bench-w1')

const people: { id: string; cookie: string }[] = []
for (let i = 0; i < 10; i++) {
  const u = await makeUser(ds, `Scale${i}`)
  people.push({ id: u.id, cookie: await signIn(urls[0]!, u.email) })
}
const newRoom = () =>
  makeRoom(
    ds,
    people.map((p, i) => ({ userId: p.id, role: i === 0 ? 'owner' : 'editor' })),
  )
const report: Record<string, unknown> = {
  when: new Date().toISOString(),
  node: process.version,
  instances: N,
  workers: M,
  seconds: SECONDS,
}
const percentile = (runs: [number, number][], p: number) => {
  const total = runs.reduce((s, [, n]) => s + n, 0)
  let rank = Math.min(total - 1, Math.floor((p / 100) * total))
  for (const [ms, n] of [...runs].sort((a, b) => a[0] - b[0])) if ((rank -= n) < 0) return ms
  return Number.NaN
}

/** One bench-load.ts client process per room; editors spread over the instances. */
function clients(roomId: string): Promise<{ edits: number; update: [number, number][] }> {
  return new Promise((done, reject) => {
    const job = { url: urls[0], urls, rooms: [{ roomId, cookies: people.map((p) => p.cookie) }] }
    const child = spawn(process.execPath, ['--import', 'tsx', resolve(root, 'scripts/bench-load.ts'), '--clients'], {
      env: { ...env, BENCH_JOB: JSON.stringify(job), BENCH_SECONDS: String(SECONDS) },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let text = ''
    child.stdout.on('data', (d: Buffer) => (text += d.toString()))
    child.on('close', () => {
      const last = text.trim().split('\n').at(-1) ?? ''
      if (last.startsWith('{')) done(JSON.parse(last))
      else reject(new Error(`bench clients gave no summary: ${text.slice(-300)}`))
    })
  })
}

try {
  console.log(
    `\n${N} instance(s); rooms × 10 editors, editors spread over the instances (edit → peer, target p99 100 ms)`,
  )
  const relay = []
  for (const rooms of (process.env.BENCH_ROOMS ?? '1,5,10').split(',').map(Number)) {
    const ids = await Promise.all(Array.from({ length: rooms }, newRoom))
    const outs = await Promise.allSettled(ids.map(clients))
    const ok = outs.flatMap((o) => (o.status === 'fulfilled' ? [o.value] : []))
    const update = ok.flatMap((o) => o.update)
    const row = {
      rooms,
      editors: rooms * 10,
      edits: ok.reduce((s, o) => s + o.edits, 0),
      p50: percentile(update, 50),
      p99: percentile(update, 99),
      failedRooms: rooms - ok.length,
    }
    relay.push(row)
    console.log(
      `rooms ${String(rooms).padStart(2)} | edits ${String(row.edits).padStart(5)} | p50 ${row.p50.toFixed(1)} ms p99 ${row.p99.toFixed(1)} ms${row.failedRooms ? ` | ${row.failedRooms} room(s) failed` : ''}`,
    )
  }
  report.relay = relay

  // Solve throughput: rooms on a ~1 800-vertex mesh, each editing again once its last edit is solved.
  const editor = people[0]!
  const rooms = await Promise.all(
    Array.from({ length: solveRooms }, async (_, i) => {
      const roomId = await newRoom()
      const url = urls[i % urls.length]!
      const client = connectDoc(url, roomId, editor.cookie)
      await client.synced
      setSettings(client.doc, { edgeLength: 0.15 })
      const stream = connectStream(url, editor.cookie)
      const surfaces: Uint8Array[] = []
      stream.on(
        'surface',
        (s: { coarse: boolean; stateVector: Uint8Array }) => !s.coarse && surfaces.push(new Uint8Array(s.stateVector)),
      )
      await stream.timeout(30_000).emitWithAck('room:join', { roomId })
      return { client, stream, surfaces }
    }),
  )
  const solvedUpTo = (r: (typeof rooms)[number], clock: number) =>
    r.surfaces.some((sv) => (Y.decodeStateVector(sv).get(r.client.doc.clientID) ?? 0) >= clock)
  const throughput = async (workers: number) => {
    // Warm-up: every room solved once at this mesh size before timing.
    for (const r of rooms) await until(() => r.surfaces.length > 0, 120_000, 'first surface')
    let solved = 0
    const end = Date.now() + SECONDS * 1000
    await Promise.all(
      rooms.map(async (r, k) => {
        for (let step = 1; Date.now() < end; step++) {
          movePoint(r.client.doc, loopsOf(r.client.doc).get(0).get('id') as string, 'b3', {
            z: 0.3 + 0.01 * ((step + k) % 50),
          })
          const clock = Y.getState(r.client.doc.store, r.client.doc.clientID)
          await until(() => solvedUpTo(r, clock), 120_000, 'solve')
          if (Date.now() <= end) solved++
        }
      }),
    )
    const row = { workers, rooms: solveRooms, solved, solvesPerSecond: solved / SECONDS }
    console.log(
      `workers ${workers} | ${solveRooms} rooms | ${solved} solves in ${SECONDS} s → ${row.solvesPerSecond.toFixed(2)} solves/s`,
    )
    return row
  }
  console.log(`\nsolve throughput (${solveRooms} rooms, ~1 800-vertex meshes, each edits again once solved)`)
  const solves = [await throughput(1)]
  for (let w = 2; w <= M; w++) startWorker(`bench-w${w}`)
  if (M > 1) {
    await new Promise((r) => setTimeout(r, 15_000)) // the new workers boot (tsx, warm-up solve)
    solves.push(await throughput(M))
  }
  report.solves = solves
  for (const r of rooms) {
    r.client.destroy()
    r.stream.close()
  }
} finally {
  await Promise.all(children.map((c) => hm.stopChild(c)))
  await ds.destroy()
  await dbm.dropDatabase({ port: db.port, database })
  await rm.stopRedis({ port: redisPort, dataDir })
  rmSync(dataDir, { recursive: true, force: true })
}
const calibrationAfter = calibrationMs()
Object.assign(report, {
  loadAverage: loadavg(),
  calibrationMs: [calibrationBefore, calibrationAfter],
  cpus: cpus().length,
})
console.log(
  `\ncalibration loop ${calibrationBefore.toFixed(0)} ms before, ${calibrationAfter.toFixed(0)} ms after (≈100 ms on an idle core);` +
    ` load average ${loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')} on ${cpus().length} cores`,
)
mkdirSync(resolve(root, 'bench-results'), { recursive: true })
writeFileSync(resolve(root, `bench-results/scale-${N}.json`), JSON.stringify(report, null, 2))
console.log(`wrote bench-results/scale-${N}.json`)
process.exit(0)
