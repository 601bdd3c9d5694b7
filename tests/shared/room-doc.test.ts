import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { readRawFrame, writeFrame, loopsOf } from '../../shared/room-doc/schema'
import { deletePoint, insertPointAfter, movePoint, setEdge, addHole } from '../../shared/room-doc/edits'
import { starterFrame, STARTERS } from '../../shared/room-doc/starters'
import type { Frame } from '../../shared/types'

/** Two replicas exchanging every update, as the sync endpoint does. */
function pair(): [Y.Doc, Y.Doc] {
  const a = new Y.Doc()
  const b = new Y.Doc()
  writeFrame(a, starterFrame('blank'))
  Y.applyUpdate(b, Y.encodeStateAsUpdate(a))
  return [a, b]
}

function sync(a: Y.Doc, b: Y.Doc): void {
  Y.applyUpdate(b, Y.encodeStateAsUpdate(a, Y.encodeStateVector(b)))
  Y.applyUpdate(a, Y.encodeStateAsUpdate(b, Y.encodeStateVector(a)))
}

const ids = (doc: Y.Doc): { loop: string; points: string[] } => {
  const loop = loopsOf(doc).get(0)
  const pts = loop.get('points') as Y.Array<Y.Map<unknown>>
  return { loop: loop.get('id') as string, points: pts.toArray().map((p) => p.get('id') as string) }
}

describe('room document', () => {
  it('writes and reads back every starting frame unchanged', () => {
    for (const { key } of STARTERS) {
      const doc = new Y.Doc()
      const frame = starterFrame(key)
      writeFrame(doc, frame)
      const raw = readRawFrame(doc) as Frame
      expect(raw.loops.map((l) => l.points)).toEqual(frame.loops.map((l) => l.points))
      expect(raw.loops.map((l) => l.edges)).toEqual(
        frame.loops.map((l) => l.edges.map((e) => (e.kind === 'cable' ? e : { kind: e.kind }))),
      )
      expect(raw.prestress).toEqual(frame.prestress)
    }
  })

  it('keeps both moves when two people move different points at once', () => {
    const [a, b] = pair()
    const { loop, points } = ids(a)
    movePoint(a, loop, points[0]!, { z: 1.5 })
    movePoint(b, loop, points[2]!, { x: 6.4 })
    sync(a, b)
    for (const doc of [a, b]) {
      const f = readRawFrame(doc) as Frame
      expect(f.loops[0]!.points[0]!.z).toBe(1.5)
      expect(f.loops[0]!.points[2]!.x).toBe(6.4)
    }
  })

  it('keeps both points when two people insert on the same edge at once', () => {
    const [a, b] = pair()
    const { loop, points } = ids(a)
    insertPointAfter(a, loop, points[0]!, { x: 2, y: 0, z: 0 })
    insertPointAfter(b, loop, points[0]!, { x: 4, y: 0, z: 0 })
    sync(a, b)
    const fa = readRawFrame(a) as Frame
    expect(fa.loops[0]!.points).toHaveLength(6)
    expect(readRawFrame(b)).toEqual(fa)
  })

  it('ends a drag cleanly when a peer deletes the dragged point', () => {
    const [a, b] = pair()
    insertPointAfter(a, ids(a).loop, ids(a).points[0]!, { x: 3, y: -1, z: 0 })
    sync(a, b)
    const { loop, points } = ids(a)
    const dragged = points[1]!
    expect(deletePoint(a, loop, dragged)).toBe(true)
    movePoint(b, loop, dragged, { x: 3.5 })
    sync(a, b)
    expect(movePoint(b, loop, dragged, { x: 3.6 })).toBe(false)
    expect(readRawFrame(a)).toEqual(readRawFrame(b))
    expect((readRawFrame(b) as Frame).loops[0]!.points).toHaveLength(4)
  })

  it('refuses to delete below three points, stores cable tension and holes', () => {
    const [a] = pair()
    const { loop, points } = ids(a)
    deletePoint(a, loop, points[0]!)
    expect(deletePoint(a, loop, points[1]!)).toBe(false)
    setEdge(a, loop, points[1]!, 'cable', 12)
    addHole(a, [
      { x: 2, y: 2, z: 1 },
      { x: 3, y: 2, z: 1 },
      { x: 3, y: 3, z: 1 },
    ])
    const f = readRawFrame(a) as Frame
    expect(f.loops[0]!.edges[0]).toEqual({ kind: 'cable', tension: 12 })
    expect(f.loops[1]!.role).toBe('hole')
  })
})
