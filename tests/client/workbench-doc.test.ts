import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { writeFrame, loopsOf } from '../../shared/room-doc/schema'
import { movePoint, insertPointAfter } from '../../shared/room-doc/edits'
import { starterFrame } from '../../shared/room-doc/starters'
import { frameRows, readFrameView } from '../../src/lib/frame-view'
import { frameLines, frameBounds } from '../../src/components/workbench/frame-geometry'
import { createUndoManager, includesClock, ownClock } from '../../src/api/collaboration'

/** Two documents that exchange every update, like two browsers through the sync server. */
function linkedPair(): [Y.Doc, Y.Doc] {
  const a = new Y.Doc()
  const b = new Y.Doc()
  a.on('update', (u: Uint8Array, origin: unknown) => origin !== 'remote' && Y.applyUpdate(b, u, 'remote'))
  b.on('update', (u: Uint8Array, origin: unknown) => origin !== 'remote' && Y.applyUpdate(a, u, 'remote'))
  return [a, b]
}

describe('document → points table', () => {
  it('lists the outer loop then the holes, in loop order, with the values in the document', () => {
    const doc = new Y.Doc()
    const tent = starterFrame('tent')
    writeFrame(doc, tent)
    const view = readFrameView(doc)
    const rows = frameRows(view)
    expect(rows).toHaveLength(tent.loops[0]!.points.length + tent.loops[1]!.points.length)
    expect(rows[0]).toMatchObject({ loopLabel: 'Outer', label: 'P1', ...tent.loops[0]!.points[0] })
    expect(rows[4]).toMatchObject({ loopLabel: 'Hole 1', label: 'P1', ...tent.loops[1]!.points[0] })
    expect(new Set(rows.map((r) => r.key)).size).toBe(rows.length)
    expect(view.prestress).toEqual(tent.prestress)
    expect(view.edgeLength).toBe(tent.mesh.edgeLength)
  })

  it('shows a bad value as NaN instead of hiding the point', () => {
    const doc = new Y.Doc()
    writeFrame(doc, starterFrame('blank'))
    const point = loopsOf(doc).get(0).get('points') as Y.Array<Y.Map<unknown>>
    point.get(1).set('x', 'eleven')
    const rows = frameRows(readFrameView(doc))
    expect(rows).toHaveLength(4)
    expect(Number.isNaN(rows[1]!.x)).toBe(true)
    // the edges touching the bad point are left out of the drawing, the others stay
    expect(frameLines(readFrameView(doc)).segments).toHaveLength(2)
  })

  it('splits rigid and cable edges for drawing (arch starter: two cables)', () => {
    const doc = new Y.Doc()
    const arch = starterFrame('arch')
    writeFrame(doc, arch)
    const lines = frameLines(readFrameView(doc))
    const n = arch.loops[0]!.points.length
    expect(lines.cable.length).toBe(2 * 6)
    expect(lines.rigid.length).toBe((n - 2) * 6)
    expect(frameBounds(readFrameView(doc))).toEqual({ min: { x: 0, y: 0, z: 0.4 }, max: { x: 10, y: 6, z: 3 } })
  })

  it('gives an empty view for an empty document', () => {
    expect(frameRows(readFrameView(new Y.Doc()))).toEqual([])
  })
})

// Expected behaviour from the Yjs documentation of Y.UndoManager: only transactions whose origin is
// in trackedOrigins are captured, and undo reverts them without touching other clients' changes.
describe('undo of own edits only', () => {
  it('undoes my move and keeps the peer move made after it', () => {
    const [a, b] = linkedPair()
    writeFrame(a, starterFrame('sail'))
    const mine = { who: 'a' }
    const undo = createUndoManager(a, mine)
    const [p1, p2] = frameRows(readFrameView(a))
    movePoint(a, p1!.loopId, p1!.id, { z: 5 }, mine)
    undo.stopCapturing()
    movePoint(b, p2!.loopId, p2!.id, { z: 7 }, { who: 'b' })
    expect(frameRows(readFrameView(a))[1]!.z).toBe(7)
    undo.undo()
    for (const doc of [a, b]) {
      const rows = frameRows(readFrameView(doc))
      expect(rows[0]!.z).toBe(p1!.z)
      expect(rows[1]!.z).toBe(7)
    }
    undo.redo()
    expect(frameRows(readFrameView(b))[0]!.z).toBe(5)
  })

  it('has nothing to undo when only a peer edited', () => {
    const [a, b] = linkedPair()
    writeFrame(b, starterFrame('blank'), { who: 'b' })
    const undo = createUndoManager(a, { who: 'a' })
    const [p1] = frameRows(readFrameView(a))
    insertPointAfter(b, p1!.loopId, p1!.id, { x: 3, y: -0.5, z: 0 }, { who: 'b' })
    expect(undo.canUndo()).toBe(false)
    expect(frameRows(readFrameView(a))).toHaveLength(5)
  })
})

describe('surface includes my edit', () => {
  it('compares the surface state vector with my clock after the edit', () => {
    const [a, b] = linkedPair()
    writeFrame(a, starterFrame('blank'))
    const before = Y.encodeStateVector(b)
    const [p1] = frameRows(readFrameView(a))
    movePoint(a, p1!.loopId, p1!.id, { x: 0.5 })
    const clock = ownClock(a)
    expect(includesClock(before, a.clientID, clock)).toBe(false)
    expect(includesClock(Y.encodeStateVector(b), a.clientID, clock)).toBe(true)
    expect(includesClock(new Uint8Array([255]), a.clientID, clock)).toBe(false)
  })
})
