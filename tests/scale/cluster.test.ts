/**
 * Scale-out on loopback (issue 10): two app instances, Redis, two solve workers and HAProxy, as
 * real processes. What is promised: an edit through one instance reaches clients of the other
 * with its surface; seams laid on one come back from a worker as a pattern, after their surface;
 * pins and snapshots made on one show on the other; a worker killed mid-solve
 * leaves its job to the other; Redis restarting costs a pause, not edits; an instance killed hard
 * sends its clients through the proxy to the other, where they converge with nothing lost.
 * Geometry is checked by a fact of the mesh contract (shared/mesh/README.md: every frame point is
 * a mesh vertex), as in tests/realtime/surface.test.ts.
 */
import type { Redis } from 'ioredis'
import type { Socket } from 'socket.io-client'
import type { DataSource } from 'typeorm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { closeRedis, createRedis } from '../../server/scale/redis.js'
import { keys } from '../../server/scale/solve-jobs.js'
import { insertPointAfter, movePoint, setSettings } from '../../shared/room-doc/edits.js'
import { addSeamFamily, removeSeamFamily } from '../../shared/room-doc/seams.js'
import { parseServerEvent, type PatternEvent } from '../../shared/protocol/index.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { killHard, testEnv } from '../fault/child-server.js'
import {
  apiAs,
  connectDoc,
  connectStream,
  hasVertexNear,
  makeRoom,
  makeUser,
  signIn,
  until,
  type DocClient,
} from '../realtime/live-helpers.js'
import { startCluster, type Cluster } from './cluster-harness.js'

interface SurfaceEvent {
  roomId: string
  version: number
  stateVector: Uint8Array
  coarse: boolean
  vertices: Float32Array
  solver: { converged: boolean }
}
interface StateEvent {
  roomId: string
  version: number
  state: string
}

let cluster: Cluster
let ds: DataSource
let redis: Redis
let owner: { id: string; email: string }
let editor: { id: string; email: string }
let roomId: string
const closers: (() => void)[] = []

const frameJson = (doc: Y.Doc) => JSON.stringify(readRawFrame(doc))
const outer = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string
const pointCount = (doc: Y.Doc) => (readRawFrame(doc) as { loops: { points: unknown[] }[] }).loops[0]!.points.length

function doc(url: string, cookie: string): DocClient {
  const client = connectDoc(url, roomId, cookie)
  closers.push(() => client.destroy())
  return client
}

/** A joined surface-stream client that records surfaces (binary viewed as typed arrays), states and pins. */
async function stream(url: string, cookie: string) {
  const socket: Socket = connectStream(url, cookie)
  closers.push(() => socket.close())
  const surfaces: SurfaceEvent[] = []
  const states: StateEvent[] = []
  const pins: { pin: { id: string } }[] = []
  const patterns: PatternEvent[] = []
  /** Arrival order of fine surfaces and patterns, by version. */
  const arrivals: string[] = []
  socket.on('surface', (s: SurfaceEvent) => {
    const copy = (b: unknown) => new Uint8Array(b as Uint8Array).slice().buffer
    surfaces.push({
      ...s,
      stateVector: new Uint8Array(copy(s.stateVector)),
      vertices: new Float32Array(copy(s.vertices)),
    })
    if (!s.coarse) arrivals.push(`surface ${s.version}`)
  })
  socket.on('solve:state', (s: StateEvent) => states.push(s))
  socket.on('pattern', (raw: unknown) => {
    // the emitter's wire form must pass the protocol's own schema, as in one process
    const p = parseServerEvent('pattern', raw)
    patterns.push(p)
    arrivals.push(`pattern ${p.version}`)
  })
  socket.on('pin:changed', (p: { pin: { id: string } }) => pins.push(p))
  const ack = (await socket.timeout(20_000).emitWithAck('room:join', { roomId })) as { ok: boolean }
  expect(ack.ok).toBe(true)
  return { socket, surfaces, states, pins, patterns, arrivals }
}

/** A fine surface whose state vector includes everything `client` had written when this was called. */
function includesNow(client: DocClient): (s: SurfaceEvent) => boolean {
  const clock = Y.decodeStateVector(Y.encodeStateVector(client.doc)).get(client.doc.clientID) ?? 0
  return (s) => !s.coarse && (Y.decodeStateVector(s.stateVector).get(client.doc.clientID) ?? 0) >= clock
}

beforeAll(async () => {
  ds = await createDataSource(loadConfig(testEnv())).initialize()
  cluster = await startCluster()
  redis = createRedis(String(cluster.env.REDIS_URL), 'cluster test')
  owner = await makeUser(ds, 'Rigger')
  editor = await makeUser(ds, 'Detailer')
  roomId = await makeRoom(ds, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
  ])
}, 400_000)

afterAll(async () => {
  for (const close of closers) close()
  if (redis) await closeRedis(redis)
  await cluster?.stop()
  await ds?.destroy()
}, 60_000)

describe('two instances, Redis, two workers, HAProxy', () => {
  let cookieOwner: string
  let cookieEditor: string
  let onA: DocClient
  let onB: DocClient
  let watchB: Awaited<ReturnType<typeof stream>>

  it('answers health with db, redis and a stable instance id on each instance', async () => {
    for (const [name, inst] of Object.entries(cluster.instances)) {
      const health = await (await fetch(`${inst.url}/api/health`)).json()
      expect(health).toEqual({ ok: true, db: 'up', redis: 'up', instance: name })
    }
  })

  it('relays an edit made through A to a client of B, with its surface', async () => {
    cookieOwner = await signIn(cluster.instances.a.url, owner.email)
    cookieEditor = await signIn(cluster.instances.b.url, editor.email)
    onA = doc(cluster.instances.a.url, cookieOwner)
    onB = doc(cluster.instances.b.url, cookieEditor)
    await Promise.all([onA.synced, onB.synced])
    watchB = await stream(cluster.instances.b.url, cookieEditor)

    movePoint(onA.doc, outer(onA.doc), 'b3', { z: 1.2 })
    const withEdit = includesNow(onA)
    await until(() => frameJson(onB.doc) === frameJson(onA.doc), 10_000, 'edit relayed to B')
    await until(() => watchB.surfaces.some(withEdit), 90_000, 'surface with the edit on B')
    // The blank square's corner (6, 6) now stands at 1.2 m: the mesh has a vertex there.
    expect(hasVertexNear(watchB.surfaces.find(withEdit)!.vertices, 6, 6, 1.2)).toBe(true)
  }, 120_000)

  it('lays seams made on A flat in a worker and sends B the pattern after its surface', async () => {
    const family = addSeamFamily(onA.doc, { kind: 'parallel', angle: 0, spacing: 2, offset: 0.5 })
    await until(() => watchB.patterns.some((p) => p.result !== null), 90_000, 'pattern on B')
    const first = watchB.patterns.find((p) => p.result !== null)!
    expect(first.result!.strips.length).toBeGreaterThanOrEqual(3)
    expect(first.flat.uv).toBeInstanceOf(Float32Array)
    const at = (what: string) => watchB.arrivals.indexOf(`${what} ${first.version}`)
    expect(at('surface')).toBeGreaterThanOrEqual(0)
    expect(at('surface')).toBeLessThan(at('pattern'))
    // removing the seams clears the pattern (the instance tells the room itself)
    const before = watchB.patterns.length
    removeSeamFamily(onA.doc, family)
    await until(
      () => watchB.patterns.slice(before).some((p) => p.result === null && p.error === null),
      30_000,
      'cleared pattern on B',
    )
  }, 120_000)

  it('shows on A the pins and snapshots made on B', async () => {
    const watchA = await stream(cluster.instances.a.url, cookieOwner)
    const b = cluster.instances.b.url
    const pin = await apiAs<{ pin: { id: string } }>(b, cookieEditor, 'POST', `/api/rooms/${roomId}/pins`, {
      x: 3,
      y: 3,
      z: 0.3,
      docVersion: 1,
      body: 'Check the corner plate',
    })
    const pinId = pin.pin.id
    await until(() => watchA.pins.some((p) => p.pin.id === pinId), 10_000, 'pin event on A')

    await until(() => watchB.states.at(-1)?.state === 'settled', 90_000, 'settled before the snapshot')
    await apiAs(b, cookieEditor, 'POST', `/api/rooms/${roomId}/snapshots`, { name: 'Corner raised', note: '' })
    const listed = await apiAs(cluster.instances.a.url, cookieOwner, 'GET', `/api/rooms/${roomId}/snapshots`)
    expect(JSON.stringify(listed)).toContain('Corner raised')
    const pins = await apiAs(cluster.instances.a.url, cookieOwner, 'GET', `/api/rooms/${roomId}/pins`)
    expect(JSON.stringify(pins)).toContain(pinId)
  }, 120_000)

  it('finishes a solve on the other worker when the one running it is killed', async () => {
    // One update, so one job: a fine mesh (≈ 25 000 vertices on the 6 m square) keeps a worker busy.
    onA.doc.transact(() => {
      setSettings(onA.doc, { edgeLength: 0.04 })
      movePoint(onA.doc, outer(onA.doc), 'b3', { z: 1.5 })
    })
    const withEdit = includesNow(onA)
    let solving: string | null = null
    const poll = setInterval(() => void redis.get(keys.running(roomId)).then((id) => (solving = id)), 20)
    await until(() => solving !== null, 60_000, 'a worker solving').finally(() => clearInterval(poll))
    const victim = cluster.workers.find((w) => w.id === solving)!
    const killedAt = Date.now()
    await killHard({ child: victim.child, url: '', port: 0 })
    // Had the victim finished first, this test would prove nothing.
    expect(watchB.surfaces.some(withEdit)).toBe(false)
    await until(() => watchB.surfaces.some(withEdit), 120_000, 'surface from the other worker')
    console.log(`worker ${victim.id} killed mid-solve; surface from the other ${Date.now() - killedAt} ms later`)
    const survivor = cluster.workers.find((w) => w !== victim)!
    // The worker records itself as the room's home just after it sends the surface: wait for that write.
    await until(
      async () => (await redis.get(keys.home(roomId))) === survivor.id,
      10_000,
      `home moved to ${survivor.id}`,
    )
    expect(hasVertexNear(watchB.surfaces.find(withEdit)!.vertices, 6, 6, 1.5)).toBe(true)
    cluster.workers.splice(cluster.workers.indexOf(victim), 1)
    setSettings(onA.doc, { edgeLength: 0.3 })
  }, 180_000)

  it('catches up after a Redis restart: edits made while it was down reach the other instance', async () => {
    await cluster.stopRedis()
    movePoint(onA.doc, outer(onA.doc), 'b1', { z: 0.4 })
    const withEdit = includesNow(onA)
    const health = async () => (await fetch(`${cluster.instances.a.url}/api/health`)).json()
    await until(async () => (await health()).redis === 'down', 10_000, 'A reports Redis down', 50)
    expect(await health()).toMatchObject({ ok: false, db: 'up', redis: 'down' })
    await cluster.startRedis()
    await until(() => frameJson(onB.doc) === frameJson(onA.doc), 30_000, 'B caught up')
    await until(() => watchB.surfaces.some(withEdit), 90_000, 'surface after Redis came back')
  }, 150_000)

  it('moves clients of a killed instance through the proxy to the other, converging with nothing lost', async () => {
    const proxy = cluster.proxyUrl
    // The proxy's stickiness cookie pins each client to one instance until that one is down.
    const viaA = doc(proxy, `${cookieOwner}; VRINSTANCE=a`)
    const viaB = doc(proxy, `${cookieEditor}; VRINSTANCE=b`)
    await Promise.all([viaA.synced, viaB.synced])
    let after = 'b2'
    for (let i = 0; i < 4; i++)
      after = insertPointAfter(viaA.doc, outer(viaA.doc), after, { x: 6 - i * 0.2, y: 0.5 + i, z: 0.1 })!
    await until(() => frameJson(viaB.doc) === frameJson(viaA.doc), 10_000, 'edits relayed before the crash')

    await killHard(cluster.instances.a)
    // Written while its instance is gone: kept by the client and sent once it reconnects.
    movePoint(viaA.doc, outer(viaA.doc), 'b4', { z: 0.9 })
    await until(() => frameJson(viaB.doc) === frameJson(viaA.doc), 30_000, 'converged through B')
    expect(pointCount(viaB.doc)).toBe(8)
    const late = doc(proxy, cookieEditor)
    await late.synced
    await until(() => frameJson(late.doc) === frameJson(viaA.doc), 10_000, 'a new client sees the same frame')
    expect(JSON.stringify(readRawFrame(late.doc))).toContain('"z":0.9')
  }, 120_000)
})
