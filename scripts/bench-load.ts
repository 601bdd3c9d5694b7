/**
 * `npm run bench:load`: how many editors per room, and how many rooms per server process, the live
 * room holds on loopback before edit → peer update p99 passes 100 ms. Two ladders: one room with
 * 10, 30, 60, 100 editors; then 10 editors per room in 1, 5, 20 rooms. Each ladder stops at the
 * first step over the target. Prints editors per room and rooms held, memory per room (rss and
 * heap growth after the room's clients connected, divided by rooms) and the server's event-loop
 * delay (perf_hooks monitorEventLoopDelay, in this process, which runs the server). Writes
 * bench-results/load.json.
 *
 * The server (with its MariaDB, solve workers and the blank 6 m starter frame) runs here; the
 * simulated editors run in child processes (this file with --clients), whole rooms per child, so
 * edit and arrival are timed on one clock. Env: BENCH_SECONDS (5), BENCH_RATE (edits per second
 * per editor, 2), BENCH_TARGET_MS (100).
 */
import { spawn } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { monitorEventLoopDelay } from 'node:perf_hooks'
import { startBenchServer } from './bench-server.js'

const root = resolve(import.meta.dirname, '..')
const SECONDS = Number(process.env.BENCH_SECONDS ?? 5)
const RATE = Number(process.env.BENCH_RATE ?? 2)
const TARGET_MS = Number(process.env.BENCH_TARGET_MS ?? 100)
/** Rooms are spread over child processes, one room per child, so the editors' own yjs work is shared out. */

interface Job {
  url: string
  rooms: { roomId: string; cookies: string[] }[]
}
interface ClientResult {
  edits: number
  update: number[]
  /** The editors' own process: when this is high, the clients, not the server, set the latency. */
  clientLoopDelayP99Ms: number
}
interface Step {
  editorsPerRoom: number
  rooms: number
}

if (process.argv.includes('--clients')) {
  // Each y-websocket provider adds a process 'exit' listener.
  process.setMaxListeners(0)
  const job = JSON.parse(process.env.BENCH_JOB ?? '{}') as Job
  process.stdout.write('\n' + JSON.stringify(await runClients(job)) + '\n')
  process.exit(0)
}
await main()

/** The server side: ladders of steps, each step's clients in child processes. */
async function main(): Promise<void> {
const { running, people, room, close } = await startBenchServer(100, 'Load')

function children(job: Job): Promise<ClientResult> {
  return new Promise((done, reject) => {
    const child = spawn(process.execPath, ['--import', 'tsx', resolve(root, 'scripts/bench-load.ts'), '--clients'], {
      env: { ...process.env, BENCH_JOB: JSON.stringify(job) },
      stdio: ['ignore', 'pipe', 'inherit'],
    })
    let text = ''
    child.stdout.on('data', (d: Buffer) => (text += d.toString()))
    child.on('exit', (code) => {
      const last = text.trim().split('\n').at(-1) ?? ''
      if (code === 0 && last.startsWith('{')) done(JSON.parse(last) as ClientResult)
      else reject(new Error(`bench clients exited with ${code}: ${text.slice(-400)}`))
    })
  })
}

const percentile = (values: number[], p: number) => {
  if (!values.length) return Number.NaN
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!
}

async function runStep({ editorsPerRoom, rooms }: Step) {
  const members = people.slice(0, editorsPerRoom)
  const jobRooms: Job['rooms'] = []
  for (let r = 0; r < rooms; r++) {
    const roomId = await room(members)
    await running.realtime.ensureRoomFrame(roomId, 'blank')
    jobRooms.push({ roomId, cookies: members.map((m) => m.cookie) })
  }
  const jobs: Job[] = jobRooms.map((room) => ({ url: running.url, rooms: [room] }))
  global.gc?.()
  const before = process.memoryUsage()
  const loopDelay = monitorEventLoopDelay({ resolution: 10 })
  loopDelay.enable()
  // Memory is sampled while the clients are connected: rooms are freed once the last one leaves.
  let peak = before
  const sampler = setInterval(() => {
    const m = process.memoryUsage()
    if (m.rss > peak.rss) peak = m
  }, 200)
  const outs = await Promise.all(jobs.map(children))
  clearInterval(sampler)
  loopDelay.disable()
  const update = outs.flatMap((o) => o.update)
  return {
    editorsPerRoom,
    rooms,
    edits: outs.reduce((s, o) => s + o.edits, 0),
    updateP50: percentile(update, 50),
    updateP99: percentile(update, 99),
    rssPerRoomMb: (peak.rss - before.rss) / 2 ** 20 / rooms,
    heapPerRoomMb: (peak.heapUsed - before.heapUsed) / 2 ** 20 / rooms,
    serverLoopDelayP99Ms: loopDelay.percentile(99) / 1e6,
    serverLoopDelayMaxMs: loopDelay.max / 1e6,
    clientLoopDelayP99Ms: Math.max(...outs.map((o) => o.clientLoopDelayP99Ms)),
  }
}

// A discarded first step: the solve workers boot (TypeScript loader, warm-up solve) at start.
await runStep({ editorsPerRoom: 4, rooms: 1 })
const ladders: { name: string; steps: Step[] }[] = [
  { name: 'editors per room (1 room)', steps: [10, 30, 60, 100].map((e) => ({ editorsPerRoom: e, rooms: 1 })) },
  { name: 'rooms per process (10 editors each)', steps: [1, 5, 20].map((r) => ({ editorsPerRoom: 10, rooms: r })) },
]
const report: Record<string, unknown> = { when: new Date().toISOString(), node: process.version, seconds: SECONDS, editsPerSecondPerEditor: RATE, targetP99Ms: TARGET_MS }
const f = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—').padStart(7)
try {
  for (const ladder of ladders) {
    const results = []
    let held: Step | null = null
    console.log(`\n${ladder.name}`)
    for (const step of ladder.steps) {
      const r = await runStep(step)
      results.push(r)
      const pass = r.updateP99 <= TARGET_MS
      console.log(
        `editors/room ${String(r.editorsPerRoom).padStart(3)} rooms ${String(r.rooms).padStart(2)} | edits ${String(r.edits).padStart(5)}` +
          ` | edit→peer p50 ${f(r.updateP50)} ms p99 ${f(r.updateP99)} ms ${pass ? 'ok' : `> ${TARGET_MS} ms`}` +
          ` | per room rss ${f(r.rssPerRoomMb)} MB heap ${f(r.heapPerRoomMb)} MB | server loop delay p99 ${f(r.serverLoopDelayP99Ms)} ms max ${f(r.serverLoopDelayMaxMs)} ms | client loop p99 ${f(r.clientLoopDelayP99Ms)} ms`,
      )
      if (!pass) break
      held = step
    }
    console.log(held ? `held: ${held.editorsPerRoom} editors per room in ${held.rooms} room(s)` : 'held: none of the steps')
    report[ladder.name] = { held, results }
  }
} finally {
  await close()
}
mkdirSync(resolve(root, 'bench-results'), { recursive: true })
writeFileSync(resolve(root, 'bench-results/load.json'), JSON.stringify(report, null, 2))
console.log('wrote bench-results/load.json')
process.exit(0)
}

/**
 * One child's editors: y-websocket clients that each drag their own frame point at RATE edits per
 * second for SECONDS; every peer logs when each edit arrives (Y.parseUpdateMeta gives the clocks
 * an update carries, so one arrival can settle several logged edits).
 */
async function runClients(job: Job): Promise<ClientResult> {
  const Y = await import('yjs')
  const { connectDoc } = await import('../tests/realtime/live-helpers.js')
  const { loopsOf } = await import('../shared/room-doc/schema.js')
  const { movePoint } = await import('../shared/room-doc/edits.js')
  const result: ClientResult = { edits: 0, update: [], clientLoopDelayP99Ms: 0 }
  const loopDelay = monitorEventLoopDelay({ resolution: 10 })
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
    starts.push(() =>
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
        setTimeout(() => timers.push(setInterval(edit, 1000 / RATE)), (k * 37) % 500)
      }),
    )
  }
  loopDelay.enable()
  for (const go of starts) go()
  await new Promise((r) => setTimeout(r, SECONDS * 1000 + 500))
  for (const t of timers) clearInterval(t)
  loopDelay.disable()
  result.clientLoopDelayP99Ms = loopDelay.percentile(99) / 1e6
  await new Promise((r) => setTimeout(r, 1500))
  for (const close of teardown) close()
  return result
}
