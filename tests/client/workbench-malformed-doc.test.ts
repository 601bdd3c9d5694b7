/**
 * Issue 12 item 1, client side: the frame view and the edits meet whatever a peer wrote. A
 * misplaced type (a number for a loop, a string for `loops`) must come back as a named problem
 * beside the well-shaped parts, and edits must be refused, never thrown from a document observer.
 */
import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import {
  addHole,
  deletePoint,
  insertPointAfter,
  movePoint,
  removeHole,
  setEdge,
  setSettings,
} from '../../shared/room-doc/edits'
import { readRoomFrame } from '../../shared/room-doc/read'
import { frameMap, loopsOf, writeFrame } from '../../shared/room-doc/schema'
import { starterFrame } from '../../shared/room-doc/starters'
import { frameRows, readFrameView } from '../../src/lib/frame-view'

function tent(): Y.Doc {
  const doc = new Y.Doc()
  writeFrame(doc, starterFrame('tent'))
  return doc
}
const outer = (doc: Y.Doc) => loopsOf(doc).get(0)
const outerPoints = (doc: Y.Doc) => outer(doc).get('points') as unknown as Y.Array<unknown>

const cases: { name: string; path: string; edit: (doc: Y.Doc) => void; loops: number }[] = [
  { name: 'loops replaced by a number', path: 'loops', edit: (d) => frameMap(d).set('loops', 3), loops: 0 },
  {
    name: 'a string for a loop',
    path: 'loops[1]',
    edit: (d) => (loopsOf(d) as unknown as Y.Array<unknown>).insert(1, ['x']),
    loops: 2,
  },
  { name: 'a number for a point', path: 'loops[0].points[0]', edit: (d) => outerPoints(d).insert(0, [5]), loops: 2 },
  {
    name: 'text for the prestress map',
    path: 'prestress',
    edit: (d) => frameMap(d).set('prestress', new Y.Text('x')),
    loops: 2,
  },
]

describe('malformed room document on the client', () => {
  it.each(cases)('$name: the view names $path and keeps the well-shaped parts', ({ edit, path, loops }) => {
    const doc = tent()
    edit(doc)
    const view = readFrameView(doc)
    expect(view.problem?.path).toBe(path)
    expect(view.problem?.message).toMatch(/expected/)
    expect(view.loops).toHaveLength(loops)
    expect(() => frameRows(view)).not.toThrow()
    expect(readRoomFrame(doc)).toMatchObject({ kind: 'invalid', code: 'invalid-shape', path })
  })

  it('edits refuse parts that are not maps or lists instead of throwing', () => {
    const doc = tent()
    const loopId = outer(doc).get('id') as string
    const pointId = (outerPoints(doc).get(0) as Y.Map<unknown>).get('id') as string
    outerPoints(doc).insert(0, [7])
    // the well-shaped point can still be edited beside the bad entry
    expect(movePoint(doc, loopId, pointId, { z: 1 })).toBe(true)
    frameMap(doc).set('loops', 'gone')
    expect(movePoint(doc, loopId, pointId, { z: 2 })).toBe(false)
    expect(insertPointAfter(doc, loopId, pointId, { x: 1, y: 1, z: 0 })).toBeUndefined()
    expect(deletePoint(doc, loopId, pointId)).toBe(false)
    expect(setEdge(doc, loopId, pointId, 'cable', 10)).toBe(false)
    expect(
      addHole(doc, [
        { x: 1, y: 1, z: 0 },
        { x: 2, y: 1, z: 0 },
        { x: 2, y: 2, z: 0 },
      ]),
    ).toBeUndefined()
    expect(removeHole(doc, loopId)).toBe(false)
    frameMap(doc).set('prestress', 4)
    expect(() => setSettings(doc, { warp: 3, edgeLength: 0.5 })).not.toThrow()
    // an import replaces every part, which repairs the document
    writeFrame(doc, starterFrame('blank'))
    expect(readRoomFrame(doc).kind).toBe('frame')
    expect(readFrameView(doc).problem).toBeNull()
  })
})
