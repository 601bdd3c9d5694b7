import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import * as Y from 'yjs'
import { Awareness } from 'y-protocols/awareness'
import { writeFrame } from '../../shared/room-doc/schema'
import { starterFrame } from '../../shared/room-doc/starters'
import { movePoint } from '../../shared/room-doc/edits'
import type { StreamHandlers } from '../../src/api/socket'

// Expected behaviour comes from the agreed live-room protocol (solver states per document version,
// state vectors telling whether a surface includes an edit) and the Yjs UndoManager documentation.
// The store runs unmodified; only the two wires are replaced: the room document gets no WebSocket
// (a local Y.Doc, with a "peer" doc linked to it) and the surface stream is driven by the test.
const wires = vi.hoisted(() => ({ handlers: null as StreamHandlers | null, docs: [] as unknown[] }))

vi.mock('../../src/api/collaboration', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/api/collaboration')>()
  return {
    ...real,
    openRoomDocument: (_roomId: string, user: import('../../src/api/collaboration').PresenceUser, role: string) => {
      const doc = new Y.Doc()
      const peer = new Y.Doc()
      doc.on('update', (u: Uint8Array, o: unknown) => o !== 'remote' && Y.applyUpdate(peer, u, 'remote'))
      peer.on('update', (u: Uint8Array, o: unknown) => o !== 'remote' && Y.applyUpdate(doc, u, 'remote'))
      writeFrame(peer, starterFrame('sail'))
      wires.docs = [doc, peer]
      const awareness = new Awareness(doc)
      awareness.setLocalState({ user, held: null })
      const origin = { source: 'test' }
      // the real provider announces 'sync' once the server's state has arrived; here it already has
      const provider = { awareness, on: (event: string, cb: (s: boolean) => void) => event === 'sync' && cb(true) }
      return {
        doc,
        provider,
        origin,
        undo: real.createUndoManager(doc, origin),
        readOnly: role === 'viewer' || role === 'reviewer',
        hold: (h: unknown) => awareness.setLocalStateField('held', h),
        destroy: () => doc.destroy(),
      }
    },
  }
})

vi.mock('../../src/api/socket', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/api/socket')>()
  return {
    ...real,
    connectSurfaceStream: (handlers: StreamHandlers) => {
      wires.handlers = handlers
      return {
        socket: {},
        join: async () => ({ ok: true, role: 'editor' }),
        leave: () => undefined,
        close: () => undefined,
      }
    },
  }
})

const { useWorkbenchStore } = await import('../../src/stores/workbench')
const { CAPTURE_TIMEOUT_MS } = await import('../../src/api/collaboration')
const user = { id: 'u1', name: 'Aru', color: '#c2571a' }
const figures = {
  area: 1,
  planArea: 1,
  perimeter: 4,
  cables: [],
  heightRange: [0, 0] as [number, number],
  slopeRange: [0, 0] as [number, number],
  slopeHistogram: { edges: [0, 90], shares: [1] },
  flatThreshold: 5,
  flatShare: 1,
  pondingPockets: [],
  anticlasticShare: 0,
  reactions: [],
  residual: 0,
  minAngle: 30,
}
const surface = (version: number, stateVector: Uint8Array) => ({
  roomId: 'r1',
  version,
  stateVector,
  coarse: false,
  vertices: new Float32Array(9),
  triangles: new Uint32Array([0, 1, 2]),
  figures,
  solver: { method: 'test', iterations: 1, residual: 1e-12, converged: true, ms: 1 },
})

describe('workbench store', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('reads the frame from the document and refuses edits for a viewer', () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'viewer')
    expect(store.rows).toHaveLength(4)
    const p1 = store.rows[0]!
    expect(store.move(p1.loopId, p1.id, { z: 9 })).toBeUndefined()
    expect(store.rows[0]!.z).toBe(p1.z)
    store.close()
  })

  it('lets an editor move a point, undo only that, and keep a peer edit', async () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'editor')
    const [, peer] = wires.docs as [Y.Doc, Y.Doc]
    const [p1, p2] = [store.rows[0], store.rows[1]]
    // a slow drag: the second move comes after the capture timeout (real time: yjs keeps its own
    // reference to Date.now, so fake timers would not reach it)
    store.beginGesture()
    store.move(p1!.loopId, p1!.id, { x: 0.5 })
    await new Promise((r) => setTimeout(r, CAPTURE_TIMEOUT_MS + 100))
    store.move(p1!.loopId, p1!.id, { x: 0.7 })
    store.endGesture()
    movePoint(peer, p2!.loopId, p2!.id, { z: 6 })
    expect(store.rows[0]!.x).toBe(0.7)
    store.undo()
    expect(store.rows[0]!.x).toBe(p1!.x) // the whole drag is one step
    expect(store.rows[1]!.z).toBe(6)
    store.close()
  })

  it('follows solver states by version and knows when the surface includes my edit', () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'editor')
    const [doc] = wires.docs as [Y.Doc]
    const h = wires.handlers!
    h.status(true)
    const p1 = store.rows[0]!
    const before = Y.encodeStateVector(doc)
    store.move(p1.loopId, p1.id, { y: -0.3 })
    h.solveState({ roomId: 'r1', version: 5, state: 'settling' })
    h.solveProgress({ roomId: 'r1', version: 5, iteration: 3, residual: 1e-4 })
    expect(store.status).toMatchObject({ phase: 'settling', iteration: 3, residual: 1e-4 })
    h.surface(surface(4, before))
    expect(store.surfaceIncludesMine).toBe(false)
    expect(store.status.phase).toBe('settling') // an older surface does not end the newer solve
    h.solveState({ roomId: 'r1', version: 3, state: 'unsettled', reason: 'cancelled' })
    expect(store.status.phase).toBe('settling') // a stale state is ignored
    h.surface(surface(5, Y.encodeStateVector(doc)))
    expect(store.status).toMatchObject({ phase: 'settled', version: 5 })
    expect(store.surfaceIncludesMine).toBe(true)
    expect(store.figures?.area).toBe(1)
    h.solveState({ roomId: 'r2', version: 9, state: 'unsettled' })
    expect(store.status.phase).toBe('settled') // another room's message
    h.solveState({
      roomId: 'r1',
      version: 6,
      state: 'unsettled',
      reason: 'invalid-frame',
      message: 'Loop crosses itself',
      field: 'loops[0].points[2]',
    })
    expect(store.status).toMatchObject({ phase: 'unsettled', reason: 'invalid-frame', field: 'loops[0].points[2]' })
    store.close()
  })

  // Yjs UndoManager docs: changes in one transaction with a tracked origin form one stack item.
  it('restores a frame as one undo step, keeping a peer edit made afterwards', () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'editor')
    const [, peer] = wires.docs as [Y.Doc, Y.Doc]
    const before = store.rows.map((r) => [r.x, r.y, r.z])
    store.replaceFrame(starterFrame('tent'))
    expect(store.frame.loops.map((l) => l.role)).toEqual(['outer', 'hole'])
    expect(store.rows).toHaveLength(16)
    expect(store.canUndo).toBe(true)
    store.undo()
    expect(store.rows.map((r) => [r.x, r.y, r.z])).toEqual(before)
    expect(store.canUndo).toBe(false) // the restore was the only step
    movePoint(peer, store.rows[0]!.loopId, store.rows[0]!.id, { z: 1.25 })
    store.redo()
    expect(store.rows).toHaveLength(16)
    store.close()
  })

  it('refuses to replace the frame for a reviewer', () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'reviewer')
    expect(store.replaceFrame(starterFrame('tent'))).toBe(false)
    expect(store.rows).toHaveLength(4)
    store.close()
  })

  it('drops the selection when a peer deletes the selected point', () => {
    const store = useWorkbenchStore()
    store.open('r1', user, 'editor')
    const [, peer] = wires.docs as [Y.Doc, Y.Doc]
    store.insertAfter(store.rows[0]!.loopId, store.rows[0]!.id, { x: 4, y: -0.5, z: 1 })
    const sel = store.selection!
    expect(sel).not.toBeNull()
    const loop = (peer.getMap('frame').get('loops') as Y.Array<Y.Map<unknown>>).get(0)
    const pts = loop.get('points') as Y.Array<Y.Map<unknown>>
    pts.delete(
      pts.toArray().findIndex((p) => p.get('id') === sel.pointId),
      1,
    )
    expect(store.rows).toHaveLength(4)
    expect(store.selection).toBeNull()
    store.close()
  })
})
