/**
 * `npm run bench:live`: simulated editors dragging frame points in live rooms, measured end to end
 * through the real server (MariaDB, y-websocket endpoint, socket.io stream, solve workers).
 * Prints p50/p99 of edit → peer update (the edit reaches another editor's document) and edit → peer
 * surface (the first streamed surface whose state vector includes the edit), for 2, 10 and 30
 * editors in one room and spread over several rooms, at about 2k and 20k mesh vertices.
 * Writes bench-results/live.json. Clients run in this same process, so their work competes with the
 * server's main thread: the figures are an upper bound for one machine.
 */
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import * as Y from 'yjs'

interface DbScript {
  startDb: () => Promise<{ port: number }>
  createDatabase: (o: Record<string, unknown>) => Promise<void>
  dropDatabase: (o: { port: number; database: string }) => Promise<void>
  dbDefaults: Record<string, unknown>
}
// Plain-JS helper without type declarations; the specifier is a value so tsc does not look for them.
const dbScript = './db.mjs'
const { createDatabase, dbDefaults, dropDatabase, startDb } = (await import(dbScript)) as DbScript

const root = resolve(import.meta.dirname, '..')
const SECONDS = Number(process.env.BENCH_SECONDS ?? 6)
/** Each editor drags at this rate (a pointer-move stream throttled by the client). */
const EDITS_PER_SECOND = 5
const SIZES = [
  { label: '~2k', vertices: 2000 },
  { label: '~20k', vertices: 20000 },
]
const SCENARIOS = [
  { editors: 2, rooms: 1 },
  { editors: 10, rooms: 1 },
  { editors: 30, rooms: 1 },
  { editors: 10, rooms: 5 },
  { editors: 30, rooms: 10 },
]

const db = await startDb()
const database = `veilroom_bench_${Date.now()}`
await createDatabase({ ...dbDefaults, port: db.port, database })
Object.assign(process.env, { DB_PORT: String(db.port), DB_NAME: database, NODE_ENV: 'test', LOG_LEVEL: 'error' })

// Imported after the environment is set: the server reads it once.
const { loadConfig } = await import('../server/config.js')
const { start } = await import('../server/main.js')
const { attachRealtime } = await import('../server/realtime/index.js')
const { connectDoc, connectStream, makeRoom, makeUser, signIn, until } = await import('../tests/realtime/live-helpers.js')
const { loopsOf } = await import('../shared/room-doc/schema.js')
const { movePoint, setSettings } = await import('../shared/room-doc/edits.js')

const config = loadConfig(process.env)
const running = await start({ port: 0, config })
const wired = (running as { realtime?: ReturnType<typeof attachRealtime> }).realtime
const realtime =
  wired ??
  attachRealtime(running.server, {
    sessionMiddleware: running.sessionMiddleware,
    passportSession: running.passportSession,
    dataSource: running.dataSource,
    config,
  })

const people: { id: string; cookie: string }[] = []
for (let i = 0; i < 30; i++) {
  const u = await makeUser(running.dataSource, `Bench${i}`)
  people.push({ id: u.id, cookie: await signIn(running.url, u.email) })
}

function percentile(values: number[], p: number): number {
  if (values.length === 0) return Number.NaN
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!
}

interface Edit {
  clock: number
  t0: number
}

async function scenario(editors: number, roomCount: number, vertices: number) {
  const perRoom = Math.ceil(editors / roomCount)
  const updateLatency: number[] = []
  const surfaceLatency: number[] = []
  let edits = 0
  let surfaces = 0
  const teardown: (() => void)[] = []
  const timers: NodeJS.Timeout[] = []

  for (let r = 0; r < roomCount; r++) {
    const members = people.slice(0, perRoom)
    const roomId = await makeRoom(running.dataSource, members.map((m, i) => ({ userId: m.id, role: i === 0 ? 'owner' : 'editor' })))
    await realtime.ensureRoomFrame(roomId, 'blank')
    const clients = members.map((m) => connectDoc(running.url, roomId, m.cookie))
    teardown.push(...clients.map((c) => c.destroy))
    await Promise.all(clients.map((c) => c.synced))
    // The blank frame is a 6 m square: h from plan area ≈ 0.866 h² × vertices (equilateral lattice).
    setSettings(clients[0]!.doc, { edgeLength: Math.sqrt(36 / (0.866 * vertices)) })

    const log = new Map<number, Edit[]>(clients.map((c) => [c.doc.clientID, []]))
    for (const peer of clients) {
      const seen = new Map<number, number>()
      peer.doc.on('update', (update: Uint8Array, origin: unknown) => {
        if (origin !== peer.provider) return
        const t = performance.now()
        for (const [client, clock] of Y.parseUpdateMeta(update).to) {
          const list = log.get(client)
          if (!list || client === peer.doc.clientID) continue
          let i = seen.get(client) ?? 0
          while (i < list.length && list[i]!.clock <= clock) updateLatency.push(t - list[i++]!.t0)
          seen.set(client, i)
        }
      })
    }
    const observer = connectStream(running.url, members[0]!.cookie)
    teardown.push(() => observer.close())
    const surfaceSeen = new Map<number, number>()
    let ready = false
    observer.on('surface', (s: { stateVector: Uint8Array }) => {
      const t = performance.now()
      surfaces++
      if (!ready) return
      const sv = Y.decodeStateVector(new Uint8Array(s.stateVector))
      for (const [client, list] of log) {
        let i = surfaceSeen.get(client) ?? 0
        const clock = sv.get(client) ?? 0
        while (i < list.length && list[i]!.clock <= clock) surfaceLatency.push(t - list[i++]!.t0)
        surfaceSeen.set(client, i)
      }
    })
    const ack = await observer.timeout(10_000).emitWithAck('room:join', { roomId })
    if (!ack.ok) throw new Error(`join failed: ${JSON.stringify(ack)}`)
    // Start measuring from a settled room at the target size.
    await until(() => surfaces > 0, 60_000, 'first surface')
    ready = true

    clients.forEach((c, k) => {
      const outer = loopsOf(c.doc).get(0).get('id') as string
      const corner = `b${(k % 4) + 1}`
      let step = 0
      const edit = () => {
        movePoint(c.doc, outer, corner, { z: 0.4 * Math.sin(++step / 3 + k) })
        log.get(c.doc.clientID)!.push({ clock: Y.getState(c.doc.store, c.doc.clientID), t0: performance.now() })
        edits++
      }
      // Editors start out of phase, as people do.
      setTimeout(() => timers.push(setInterval(edit, 1000 / EDITS_PER_SECOND)), (k * 37) % 200)
    })
  }

  await new Promise((r) => setTimeout(r, SECONDS * 1000 + 200))
  for (const t of timers) clearInterval(t)
  // Let the last edits settle into a surface.
  await new Promise((r) => setTimeout(r, vertices > 5000 ? 4000 : 1500))
  for (const close of teardown) close()
  await new Promise((r) => setTimeout(r, 500))
  return {
    editors,
    rooms: roomCount,
    vertices,
    edits,
    surfaces,
    updateP50: percentile(updateLatency, 50),
    updateP99: percentile(updateLatency, 99),
    surfaceP50: percentile(surfaceLatency, 50),
    surfaceP99: percentile(surfaceLatency, 99),
    surfaceSamples: surfaceLatency.length,
  }
}

const results = []
try {
  for (const size of SIZES) {
    for (const s of SCENARIOS) {
      const r = await scenario(s.editors, s.rooms, size.vertices)
      results.push({ size: size.label, ...r })
      const f = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—')
      console.log(
        `${size.label.padEnd(5)} editors ${String(s.editors).padStart(2)} rooms ${String(s.rooms).padStart(2)} | edits ${String(r.edits).padStart(5)}` +
          ` | edit→peer update p50 ${f(r.updateP50).padStart(7)} ms p99 ${f(r.updateP99).padStart(7)} ms` +
          ` | edit→peer surface p50 ${f(r.surfaceP50).padStart(7)} ms p99 ${f(r.surfaceP99).padStart(7)} ms | surfaces ${r.surfaces}`,
      )
    }
  }
} finally {
  if (!wired) await realtime.close()
  await running.stop()
  await dropDatabase({ port: db.port, database })
}

mkdirSync(resolve(root, 'bench-results'), { recursive: true })
const out = { when: new Date().toISOString(), secondsPerScenario: SECONDS, editsPerSecondPerEditor: EDITS_PER_SECOND, node: process.version, results }
writeFileSync(resolve(root, 'bench-results/live.json'), JSON.stringify(out, null, 2))
console.log('wrote bench-results/live.json')
process.exit(0)
