/**
 * The surface stream end to end: an edit in the shared document is solved in a worker and streamed
 * over socket.io with the state vector that proves it includes the edit (server/realtime/README.md,
 * shared/protocol/README.md). Geometric checks use facts of the mesh contract (shared/mesh/README.md: every frame
 * point is a mesh vertex, so the solved surface passes through the moved point).
 */
import type { Socket } from 'socket.io-client'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { movePoint, setSettings } from '../../shared/room-doc/edits.js'
import { loopsOf } from '../../shared/room-doc/schema.js'
import {
  connectDoc,
  connectStream,
  hasVertexNear,
  makeRoom,
  signedInUser,
  startLive,
  until,
  type DocClient,
  type Live,
} from './live-helpers.js'

interface SurfaceEvent {
  roomId: string
  version: number
  stateVector: Uint8Array
  coarse: boolean
  vertices: Float32Array
  triangles: Uint32Array
  figures: { area: number }
  solver: { converged: boolean; method: string }
}
interface StateEvent {
  roomId: string
  version: number
  state: string
  reason?: string
  message?: string
  field?: string
}

let live: Live
let owner: { id: string; cookie: string }
let outsider: { id: string; cookie: string }
const closers: (() => void)[] = []

/** socket.io hands binary back as Buffers: view them as the typed arrays the protocol names. */
function typed<T extends Float32Array | Uint32Array | Uint8Array>(Kind: { new (b: ArrayBuffer): T }, data: unknown): T {
  // A copy: Node's Buffer views share a pool at unaligned offsets.
  const copy = new Uint8Array(data as Uint8Array)
  return new Kind(copy.buffer)
}

function listen(socket: Socket) {
  const surfaces: SurfaceEvent[] = []
  const states: StateEvent[] = []
  socket.on('surface', (s: SurfaceEvent) =>
    surfaces.push({
      ...s,
      stateVector: typed(Uint8Array, s.stateVector),
      vertices: typed(Float32Array, s.vertices),
      triangles: typed(Uint32Array, s.triangles),
    }),
  )
  socket.on('solve:state', (s: StateEvent) => states.push(s))
  return { surfaces, states }
}

async function join(cookie: string, roomId: string) {
  const socket = connectStream(live.url, cookie)
  closers.push(() => socket.close())
  const events = listen(socket)
  const ack = await socket.timeout(10_000).emitWithAck('room:join', { roomId })
  return { socket, ack, ...events }
}

async function room(starter: 'sail' | 'blank' = 'sail'): Promise<{ roomId: string; editor: DocClient }> {
  const roomId = await makeRoom(live.running.dataSource, [{ userId: owner.id, role: 'owner' }])
  await live.realtime.ensureRoomFrame(roomId, starter)
  const editor = connectDoc(live.url, roomId, owner.cookie)
  closers.push(() => editor.destroy())
  await editor.synced
  return { roomId, editor }
}

const outer = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string

beforeAll(async () => {
  live = await startLive()
  owner = await signedInUser(live, 'Surveyor')
  outsider = await signedInUser(live, 'Stranger')
})

afterAll(async () => {
  for (const close of closers) close()
  await live?.stop()
})

describe('surface stream', () => {
  it('refuses a join by a non-member and a handshake without a session', async () => {
    const { roomId } = await room()
    const { ack } = await join(outsider.cookie, roomId)
    expect(ack).toMatchObject({ ok: false, error: { code: 'room_not_found' } })
    const anonymous = connectStream(live.url, '')
    closers.push(() => anonymous.close())
    const error = await new Promise<Error>((resolve) => anonymous.on('connect_error', resolve))
    expect(error.message).toBe('signed_out')
  })

  it('streams a surface that includes an edit, tagged with its state vector', async () => {
    const { roomId, editor } = await room('blank')
    const watcher = await join(owner.cookie, roomId)
    expect(watcher.ack).toEqual({ ok: true, role: 'owner' })
    await until(() => watcher.surfaces.length > 0, 60_000, 'first surface')

    movePoint(editor.doc, outer(editor.doc), 'b3', { z: 1.2 })
    const clock = Y.decodeStateVector(Y.encodeStateVector(editor.doc)).get(editor.doc.clientID)!
    const includesEdit = (s: SurfaceEvent) =>
      (Y.decodeStateVector(s.stateVector).get(editor.doc.clientID) ?? 0) >= clock && !s.coarse
    await until(() => watcher.surfaces.some(includesEdit), 60_000, 'surface with the edit')
    const surface = watcher.surfaces.find(includesEdit)!
    expect(surface.roomId).toBe(roomId)
    // The square's third corner (6, 6) now stands at 1.2 m: the mesh has a vertex there.
    expect(hasVertexNear(surface.vertices, 6, 6, 1.2)).toBe(true)
    expect(hasVertexNear(surface.vertices, 6, 6, 0)).toBe(false)
    expect(surface.triangles.length % 3).toBe(0)
    expect(Math.max(...surface.triangles)).toBeLessThan(surface.vertices.length / 3)
    // A surface that is not plane has more area than its plan projection (36 m² here): the area of
    // a graph is ∫√(1+|∇u|²) dA ≥ plan area, equal only where the gradient vanishes.
    expect(surface.figures.area).toBeGreaterThan(36)
    expect(surface.figures.area).toBeLessThan(36 * 1.1)
    // the solve of this version ends, and a small smooth edit of a flat square must settle
    await until(
      () => watcher.states.some((s) => s.version === surface.version && s.state !== 'settling'),
      5000,
      'final state',
    )
    const final = watcher.states.find((s) => s.version === surface.version && s.state !== 'settling')!
    expect([final.state, final.reason]).toEqual(['settled', undefined])
    expect(surface.solver.converged).toBe(true)
  }, 150_000)

  it('reports NaN in the frame as unsettled invalid-frame, and solves again after a fix', async () => {
    const { roomId, editor } = await room('blank')
    const watcher = await join(owner.cookie, roomId)
    movePoint(editor.doc, outer(editor.doc), 'b3', { z: Number.NaN })
    await until(() => watcher.states.some((s) => s.reason === 'invalid-frame'), 60_000, 'invalid-frame state')
    const refused = watcher.states.find((s) => s.reason === 'invalid-frame')!
    expect(refused.state).toBe('unsettled')
    expect(refused.field).toMatch(/loops\[0\]\.points\[2\]\.z/)
    expect(refused.message).toBeTruthy()
    movePoint(editor.doc, outer(editor.doc), 'b3', { z: 0.5 })
    await until(
      () => watcher.surfaces.some((s) => hasVertexNear(s.vertices, 6, 6, 0.5)),
      60_000,
      'surface after the fix',
    )
  }, 150_000)

  it('sends a coarse preview before the fine surface of a large mesh without warm state', async () => {
    const { roomId, editor } = await room('blank')
    // 36 m² at 0.05 m is about 17k vertices (plan area / (0.866 h²), equilateral lattice); a raised
    // corner makes it a real solve.
    setSettings(editor.doc, { edgeLength: 0.05 })
    movePoint(editor.doc, outer(editor.doc), 'b1', { z: 0.8 })
    const watcher = await join(owner.cookie, roomId)
    await until(
      () => watcher.surfaces.some((s) => !s.coarse && s.vertices.length / 3 > 10_000),
      110_000,
      'fine surface',
    )
    const fine = watcher.surfaces.findIndex((s) => !s.coarse && s.vertices.length / 3 > 10_000)
    const coarse = watcher.surfaces.findIndex((s) => s.coarse)
    expect(coarse).toBeGreaterThanOrEqual(0)
    expect(coarse).toBeLessThan(fine)
    expect(watcher.surfaces[coarse]!.vertices.length / 3).toBeLessThan(4000)
  }, 120_000)
})
