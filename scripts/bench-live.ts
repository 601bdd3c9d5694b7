/**
 * `npm run bench:live`: simulated editors dragging frame points in live rooms, measured end to end
 * through the real server (MariaDB, y-websocket endpoint, socket.io stream, solve workers).
 * Prints p50/p99 of edit → peer update (the edit reaches another editor's document) and edit → peer
 * surface (the first streamed surface whose state vector includes the edit), for 2, 10 and 30
 * editors in one room and spread over several rooms, at about 2k and 20k mesh vertices, and the
 * server's event-loop delay. Writes bench-results/live.json.
 *
 * The server runs in this process; the simulated editors run in a child process (this same file
 * with --clients) so that their yjs work does not land on the server's event loop. Both share the
 * machine's cores with MariaDB and the solve workers.
 * Env: BENCH_SECONDS (6), BENCH_SIZES ("2000,20000"), BENCH_SCENARIOS ("2:1,10:1,30:1,10:5,30:10"
 * as editors:rooms), SOLVE_WORKERS.
 */
import { spawn } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { monitorEventLoopDelay } from 'node:perf_hooks'
import { startBenchServer } from './bench-server.js'

const root = resolve(import.meta.dirname, '..')
const SECONDS = Number(process.env.BENCH_SECONDS ?? 6)
/** Each editor drags at this rate (a pointer-move stream throttled by the client). */
const EDITS_PER_SECOND = 5

interface ClientJob {
  url: string
  rooms: { roomId: string; cookies: string[] }[]
  vertices: number
  seconds: number
}

interface ClientResult {
  edits: number
  surfaces: number
  update: number[]
  surface: number[]
}

/** What the child reports: percentiles only (the raw samples can run to megabytes). */
interface ClientSummary {
  edits: number
  surfaces: number
  update: { p50: number; p99: number; n: number }
  surface: { p50: number; p99: number; n: number }
}

if (process.argv.includes('--clients')) {
  const job = JSON.parse(process.env.BENCH_JOB ?? '{}') as ClientJob
  const r = await runClients(job)
  const summary: ClientSummary = {
    edits: r.edits,
    surfaces: r.surfaces,
    update: { p50: percentile(r.update, 50), p99: percentile(r.update, 99), n: r.update.length },
    surface: { p50: percentile(r.surface, 50), p99: percentile(r.surface, 99), n: r.surface.length },
  }
  // stdout to a pipe is asynchronous: exit only once the line is out.
  process.stdout.write('\n' + JSON.stringify(summary) + '\n', () => process.exit(0))
} else {
  await main()
}

async function main(): Promise<void> {
  const sizes = [2000, 20000].filter(
    (v) => !process.env.BENCH_SIZES || process.env.BENCH_SIZES.split(',').includes(String(v)),
  )
  const scenarios = (process.env.BENCH_SCENARIOS ?? '2:1,10:1,30:1,10:5,30:10').split(',').map((pair) => {
    const [editors, rooms] = pair.split(':').map(Number)
    return { editors: editors!, rooms: rooms! }
  })
  const { running, people, room, close } = await startBenchServer(30, 'Bench')

  const results = []
  try {
    for (const vertices of sizes) {
      for (const { editors, rooms } of scenarios) {
        const perRoom = Math.ceil(editors / rooms)
        const members = people.slice(0, perRoom)
        const jobRooms = []
        for (let r = 0; r < rooms; r++) {
          const roomId = await room(members)
          await running.realtime.ensureRoomFrame(roomId, 'blank')
          jobRooms.push({ roomId, cookies: members.map((m) => m.cookie) })
        }
        const loopDelay = monitorEventLoopDelay({ resolution: 10 })
        loopDelay.enable()
        const heapBefore = process.memoryUsage().heapUsed
        const out = await clientsProcess({ url: running.url, rooms: jobRooms, vertices, seconds: SECONDS })
        loopDelay.disable()
        const r = {
          vertices,
          editors: perRoom * rooms,
          rooms,
          edits: out.edits,
          surfaces: out.surfaces,
          updateP50: out.update.p50,
          updateP99: out.update.p99,
          updateSamples: out.update.n,
          surfaceP50: out.surface.p50,
          surfaceP99: out.surface.p99,
          surfaceSamples: out.surface.n,
          /** The server process's event-loop delay over the whole scenario (connect, edit, settle), ms. */
          serverLoopDelayP99: loopDelay.percentile(99) / 1e6,
          heapGrowthMb: (process.memoryUsage().heapUsed - heapBefore) / 2 ** 20,
        }
        results.push(r)
        const f = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—').padStart(7)
        console.log(
          `~${vertices / 1000}k`.padEnd(5) +
            ` editors ${String(r.editors).padStart(2)} rooms ${String(rooms).padStart(2)} | edits ${String(r.edits).padStart(5)}` +
            ` | edit→peer update p50 ${f(r.updateP50)} ms p99 ${f(r.updateP99)} ms` +
            ` | edit→peer surface p50 ${f(r.surfaceP50)} ms p99 ${f(r.surfaceP99)} ms | surfaces ${String(r.surfaces).padStart(4)}` +
            ` | server loop delay p99 ${f(r.serverLoopDelayP99)} ms`,
        )
      }
    }
  } finally {
    await close()
  }
  mkdirSync(resolve(root, 'bench-results'), { recursive: true })
  const out = {
    when: new Date().toISOString(),
    secondsPerScenario: SECONDS,
    editsPerSecondPerEditor: EDITS_PER_SECOND,
    node: process.version,
    results,
  }
  writeFileSync(resolve(root, 'bench-results/live.json'), JSON.stringify(out, null, 2))
  console.log('wrote bench-results/live.json')
  process.exit(0)
}

function clientsProcess(job: ClientJob): Promise<ClientSummary> {
  return new Promise((resolvePromise, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', resolve(root, 'scripts/bench-live.ts'), '--clients'], {
      env: { ...process.env, BENCH_JOB: JSON.stringify(job) },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let text = ''
    child.stdout.on('data', (d: Buffer) => (text += d.toString()))
    child.on('exit', (code) => {
      const last = text.trim().split('\n').at(-1) ?? ''
      if (code === 0 && last.startsWith('{')) resolvePromise(JSON.parse(last) as ClientSummary)
      else reject(new Error(`bench clients exited with ${code}: ${text.slice(-500)}`))
    })
  })
}

function percentile(values: number[], p: number): number {
  if (values.length === 0) return Number.NaN
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!
}

/** The simulated editors of all rooms of one scenario (child process). */
async function runClients(job: ClientJob): Promise<ClientResult> {
  const Y = await import('yjs')
  const { connectDoc, connectStream, until } = await import('../tests/realtime/live-helpers.js')
  const { loopsOf } = await import('../shared/room-doc/schema.js')
  const { movePoint, setSettings } = await import('../shared/room-doc/edits.js')

  const result: ClientResult = { edits: 0, surfaces: 0, update: [], surface: [] }
  const teardown: (() => void)[] = []
  const timers: NodeJS.Timeout[] = []
  const starts: (() => void)[] = []
  for (const { roomId, cookies } of job.rooms) {
    const clients = cookies.map((cookie) => {
      const client = connectDoc(job.url, roomId, cookie)
      teardown.push(client.destroy)
      return client
    })
    await Promise.all(clients.map((c) => c.synced))
    // The blank frame is a 6 m square: h from plan area ≈ 0.866 h² × vertices (equilateral lattice).
    setSettings(clients[0]!.doc, { edgeLength: Math.sqrt(36 / (0.866 * job.vertices)) })

    const log = new Map<number, { clock: number; t0: number }[]>(clients.map((c) => [c.doc.clientID, []]))
    for (const peer of clients) {
      const seen = new Map<number, number>()
      peer.doc.on('update', (update: Uint8Array, origin: unknown) => {
        if (origin !== peer.provider) return
        const t = performance.now()
        for (const [client, clock] of Y.parseUpdateMeta(update).to) {
          const list = log.get(client)
          if (!list || client === peer.doc.clientID) continue
          let i = seen.get(client) ?? 0
          while (i < list.length && list[i]!.clock <= clock) result.update.push(t - list[i++]!.t0)
          seen.set(client, i)
        }
      })
    }
    const observer = connectStream(job.url, cookies[0]!)
    teardown.push(() => observer.close())
    const surfaceSeen = new Map<number, number>()
    let ready = false
    let roomSurfaces = 0
    observer.on('surface', (s: { stateVector: Uint8Array; coarse: boolean }) => {
      const t = performance.now()
      roomSurfaces++
      if (!ready) return
      result.surfaces++
      const sv = Y.decodeStateVector(new Uint8Array(s.stateVector))
      for (const [client, list] of log) {
        let i = surfaceSeen.get(client) ?? 0
        const clock = sv.get(client) ?? 0
        while (i < list.length && list[i]!.clock <= clock) result.surface.push(t - list[i++]!.t0)
        surfaceSeen.set(client, i)
      }
    })
    const ack = (await observer.timeout(10_000).emitWithAck('room:join', { roomId })) as { ok: boolean }
    if (!ack.ok) throw new Error(`join failed: ${JSON.stringify(ack)}`)
    // Measure from a solved room at the target size.
    await until(() => roomSurfaces > 0, 120_000, 'first surface')
    starts.push(() => {
      ready = true
      clients.forEach((c, k) => {
        const outer = loopsOf(c.doc).get(0).get('id') as string
        const corner = `b${(k % 4) + 1}`
        let step = 0
        const edit = () => {
          movePoint(c.doc, outer, corner, { z: 0.4 * Math.sin(++step / 3 + k) })
          log.get(c.doc.clientID)!.push({ clock: Y.getState(c.doc.store, c.doc.clientID), t0: performance.now() })
          result.edits++
        }
        // Editors start out of phase, as people do.
        setTimeout(() => timers.push(setInterval(edit, 1000 / EDITS_PER_SECOND)), (k * 37) % 200)
      })
    })
  }
  for (const go of starts) go()
  await new Promise((r) => setTimeout(r, job.seconds * 1000 + 200))
  for (const t of timers) clearInterval(t)
  // Let the last edits reach everyone and settle into a surface.
  await new Promise((r) => setTimeout(r, job.vertices > 5000 ? 5000 : 2000))
  for (const close of teardown) close()
  return result
}
