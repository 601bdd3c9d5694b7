/**
 * `npm run bench:load`: how many editors per room, and how many rooms per server process, the live
 * room holds on loopback before edit → peer update p99 passes 100 ms. Two ladders: one room with
 * 10, 30, 60, 100 editors; then 10 editors per room in 1, 5, 20 rooms. Every step runs; a ladder
 * holds the last step before its first one over the target (or whose clients failed). Prints
 * editors per room and rooms held, memory per room (rss and heap growth after the room's clients
 * connected, divided by rooms), the server's event-loop delay (perf_hooks monitorEventLoopDelay, in
 * this process, which runs the server), and the load average and a calibration loop so figures
 * from a busy machine can be read as such. Writes bench-results/load.json.
 *
 * The server (with its MariaDB, solve workers and the blank 6 m starter frame) runs here; the
 * simulated editors run in child processes (this file with --clients), whole rooms per child, so
 * edit and arrival are timed on one clock. Env: BENCH_SECONDS (5), BENCH_RATE (edits per second
 * per editor, 2), BENCH_TARGET_MS (100), BENCH_STEP_TIMEOUT (seconds a step's clients may take,
 * 120 + BENCH_SECONDS).
 */
import { spawn } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { cpus, loadavg } from 'node:os'
import { monitorEventLoopDelay } from 'node:perf_hooks'
import { startBenchServer } from './bench-server.js'

const root = resolve(import.meta.dirname, '..')
const SECONDS = Number(process.env.BENCH_SECONDS ?? 5)
const RATE = Number(process.env.BENCH_RATE ?? 2)
const TARGET_MS = Number(process.env.BENCH_TARGET_MS ?? 100)
// A child that has not reported by then is killed and its step reported as failed: on a busy
// machine 100 editors may never all connect, and the ladder should go on rather than hang.
const STEP_TIMEOUT_S = Number(process.env.BENCH_STEP_TIMEOUT ?? 120 + SECONDS)
/** Rooms are spread over child processes, one room per child, so the editors' own yjs work is shared out. */

interface Job {
  url: string
  /** Editor k of a room connects to urls[k % urls.length] when given (bench-scale: editors spread over instances). */
  urls?: string[]
  rooms: { roomId: string; cookies: string[] }[]
}
interface ClientResult {
  edits: number
  update: number[]
  /** The editors' own process: when this is high, the clients, not the server, set the latency. */
  clientLoopDelayP99Ms: number
}
/** What a child sends back: the parent's figures only (the raw latencies ran to ~440 kB and were cut off). */
interface ClientSummary {
  edits: number
  /** Sorted edit → peer latencies at 0.1 ms resolution, run-length coded as [ms, count] pairs. */
  update: [number, number][]
  clientLoopDelayP99Ms: number
}
interface Step {
  editorsPerRoom: number
  rooms: number
}

if (process.argv.includes('--clients')) {
  const job = JSON.parse(process.env.BENCH_JOB ?? '{}') as Job
  const summary = summarise(await runClients(job))
  // stdout to a pipe is asynchronous: exit only once the line is out.
  process.stdout.write('\n' + JSON.stringify(summary) + '\n', () => process.exit(0))
}
await main()

/** The server side: ladders of steps, each step's clients in child processes. */
async function main(): Promise<void> {
  const { running, people, room, close } = await startBenchServer(100, 'Load')

  function children(job: Job): Promise<ClientSummary> {
    return new Promise((done, reject) => {
      const child = spawn(process.execPath, ['--import', 'tsx', resolve(root, 'scripts/bench-load.ts'), '--clients'], {
        env: { ...process.env, BENCH_JOB: JSON.stringify(job) },
        stdio: ['ignore', 'pipe', 'inherit'],
      })
      let text = ''
      child.stdout.on('data', (d: Buffer) => (text += d.toString()))
      let timedOut = false
      const deadline = setTimeout(() => {
        timedOut = true
        child.kill('SIGKILL')
      }, STEP_TIMEOUT_S * 1000)
      // 'close', not 'exit': only then has stdout been read to its end.
      child.on('close', (code) => {
        clearTimeout(deadline)
        const last = text.trim().split('\n').at(-1) ?? ''
        try {
          if (timedOut) throw new Error(`no report within ${STEP_TIMEOUT_S} s (BENCH_STEP_TIMEOUT), killed`)
          if (code !== 0 || !last.startsWith('{')) throw new Error('no summary line')
          done(JSON.parse(last) as ClientSummary)
        } catch (e) {
          reject(new Error(`bench clients exited with ${code} (${(e as Error).message}): ${text.slice(-400)}`))
        }
      })
    })
  }

  /** The p-th percentile of several children's run-length coded latencies. */
  const percentile = (runs: [number, number][], p: number) => {
    const total = runs.reduce((s, [, n]) => s + n, 0)
    if (!total) return Number.NaN
    const sorted = [...runs].sort((a, b) => a[0] - b[0])
    let rank = Math.min(total - 1, Math.floor((p / 100) * total))
    for (const [ms, n] of sorted) if ((rank -= n) < 0) return ms
    return sorted.at(-1)![0]
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
    const settled = await Promise.allSettled(jobs.map(children))
    clearInterval(sampler)
    loopDelay.disable()
    const failed = settled.flatMap((s) =>
      s.status === 'rejected' ? [String((s.reason as Error).message ?? s.reason)] : [],
    )
    const outs = settled.flatMap((s) => (s.status === 'fulfilled' ? [s.value] : []))
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
      clientLoopDelayP99Ms: outs.length ? Math.max(...outs.map((o) => o.clientLoopDelayP99Ms)) : Number.NaN,
      failed,
    }
  }

  // A discarded first step: the solve workers boot (TypeScript loader, warm-up solve) at start.
  await runStep({ editorsPerRoom: 4, rooms: 1 })
  const ladders: { name: string; steps: Step[] }[] = [
    { name: 'editors per room (1 room)', steps: [10, 30, 60, 100].map((e) => ({ editorsPerRoom: e, rooms: 1 })) },
    { name: 'rooms per process (10 editors each)', steps: [1, 5, 20].map((r) => ({ editorsPerRoom: 10, rooms: r })) },
  ]
  const report: Record<string, unknown> = {
    when: new Date().toISOString(),
    node: process.version,
    seconds: SECONDS,
    editsPerSecondPerEditor: RATE,
    targetP99Ms: TARGET_MS,
  }
  const f = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—').padStart(7)
  const calibrationBefore = calibrationMs()
  try {
    for (const ladder of ladders) {
      const results = []
      let held: Step | null = null
      let missed = false
      console.log(`\n${ladder.name}`)
      // Every step runs, also past the target, so the table shows how latency grows; "held" is the
      // last step before the first miss. A step whose clients fail reports why and counts as a miss.
      for (const step of ladder.steps) {
        const r = await runStep(step).catch((e: Error) => ({ ...step, error: e.message }))
        results.push(r)
        if ('error' in r) {
          console.log(
            `editors/room ${String(step.editorsPerRoom).padStart(3)} rooms ${String(step.rooms).padStart(2)} | failed: ${r.error}`,
          )
          missed = true
          continue
        }
        const pass = r.updateP99 <= TARGET_MS && !r.failed.length
        console.log(
          `editors/room ${String(r.editorsPerRoom).padStart(3)} rooms ${String(r.rooms).padStart(2)} | edits ${String(r.edits).padStart(5)}` +
            ` | edit→peer p50 ${f(r.updateP50)} ms p99 ${f(r.updateP99)} ms ${pass ? 'ok' : `> ${TARGET_MS} ms`}` +
            ` | per room rss ${f(r.rssPerRoomMb)} MB heap ${f(r.heapPerRoomMb)} MB | server loop delay p99 ${f(r.serverLoopDelayP99Ms)} ms max ${f(r.serverLoopDelayMaxMs)} ms | client loop p99 ${f(r.clientLoopDelayP99Ms)} ms`,
        )
        for (const why of r.failed) console.log(`  a client process failed: ${why}`)
        if (!pass) missed = true
        else if (!missed) held = step
      }
      console.log(
        held ? `held: ${held.editorsPerRoom} editors per room in ${held.rooms} room(s)` : 'held: none of the steps',
      )
      report[ladder.name] = { held, results }
    }
  } finally {
    await close()
  }
  const calibrationAfter = calibrationMs()
  const load = loadavg()
  Object.assign(report, {
    loadAverage: load,
    calibrationMs: [calibrationBefore, calibrationAfter],
    cpus: cpus().length,
  })
  console.log(
    `\ncalibration loop ${calibrationBefore.toFixed(0)} ms before, ${calibrationAfter.toFixed(0)} ms after (≈100 ms on an idle core);` +
      ` load average ${load.map((l) => l.toFixed(1)).join(' ')} (1, 5, 15 min) on ${cpus().length} cores`,
  )
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
    const clients = cookies.map((cookie, k) => {
      const client = connectDoc(job.urls?.[k % job.urls.length] ?? job.url, roomId, cookie)
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

/** Rounds to 0.1 ms and counts equal values, so a child's summary stays a few kB at any load. */
function summarise(r: ClientResult): ClientSummary {
  const counts = new Map<number, number>()
  for (const ms of r.update) {
    const key = Math.round(ms * 10) / 10
    counts.set(key, (counts.get(key) ?? 0) + 1)
  }
  return {
    edits: r.edits,
    update: [...counts].sort((a, b) => a[0] - b[0]),
    clientLoopDelayP99Ms: r.clientLoopDelayP99Ms,
  }
}

/** A fixed loop of 1e8 multiply-adds, as in bench-solver: its time says how busy the machine is (≈100 ms idle). */
function calibrationMs(): number {
  const a = new Float64Array(1e6)
  const t = performance.now()
  for (let r = 0; r < 100; r++) for (let i = 0; i < a.length; i++) a[i]! += i * 0.5
  return performance.now() - t
}
