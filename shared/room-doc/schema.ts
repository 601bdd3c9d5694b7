/**
 * The room's shared document (yjs): how a frame is laid out so that concurrent edits merge sensibly.
 *
 * root map 'frame':
 *   prestress: Y.Map { warp, fill, warpAngle }  kN/m, kN/m, degrees (warp direction in plan from +x)
 *   mesh:      Y.Map { edgeLength }        m
 *   loops:     Y.Array<Y.Map { id, role, points: Y.Array<Y.Map { id, x, y, z, edge, tension }> }>
 *
 * Each frame point is its own Y.Map, so two people moving different points both win, and two
 * points inserted at once into the same Y.Array are both kept. The edge that starts at a point is
 * stored on that point (`edge`, `tension`), so inserting or deleting a point carries its edge along.
 * Editing a point that a peer deleted is a no-op in yjs: the drag simply ends.
 */
import * as Y from 'yjs'
import type { EdgeKind, Frame } from '../types'
import { FRAME_KEY } from './read'

export { FRAME_KEY, readRawFrame } from './read'

export type YPoint = Y.Map<string | number>
export type YLoop = Y.Map<string | Y.Array<YPoint>>

/** A new random id for a point or a loop (not a security token). */
export function newId(prefix: string): string {
  return prefix + Math.random().toString(36).slice(2, 10)
}

/** The root frame map of a room document. */
export function frameMap(doc: Y.Doc): Y.Map<unknown> {
  return doc.getMap(FRAME_KEY)
}

/**
 * The loops array of a well-shaped document, created on first use (tests, benchmarks, a new room).
 * Throws when `loops` holds another type: code that may meet any document reads through read.ts.
 */
export function loopsOf(doc: Y.Doc): Y.Array<YLoop> {
  const root = frameMap(doc)
  const loops = root.get('loops')
  if (loops instanceof Y.Array) return loops as Y.Array<YLoop>
  if (loops !== undefined) throw new Error('loops: not a list (read the document through shared/room-doc/read.ts)')
  const fresh = new Y.Array<YLoop>()
  root.set('loops', fresh)
  return fresh
}

/** Builds the Y.Map of one frame point. */
export function makePoint(p: {
  id?: string
  x: number
  y: number
  z: number
  edge?: EdgeKind
  tension?: number
}): YPoint {
  const m = new Y.Map<string | number>()
  m.set('id', p.id ?? newId('p'))
  m.set('x', p.x)
  m.set('y', p.y)
  m.set('z', p.z)
  m.set('edge', p.edge ?? 'rigid')
  if (p.tension !== undefined) m.set('tension', p.tension)
  return m
}

/** Builds the Y.Map of one loop with its points. */
export function makeLoop(role: 'outer' | 'hole', points: Parameters<typeof makePoint>[0][], id?: string): YLoop {
  const loop = new Y.Map<string | Y.Array<YPoint>>()
  loop.set('id', id ?? newId('l'))
  loop.set('role', role)
  const arr = new Y.Array<YPoint>()
  arr.push(points.map(makePoint))
  loop.set('points', arr)
  return loop
}

/** Replaces the whole frame of a document with `frame` in one transaction. */
export function writeFrame(doc: Y.Doc, frame: Readonly<Frame>, origin?: unknown): void {
  doc.transact(() => {
    const root = frameMap(doc)
    const prestress = new Y.Map<number>()
    prestress.set('warp', frame.prestress.warp)
    prestress.set('fill', frame.prestress.fill)
    prestress.set('warpAngle', frame.prestress.warpAngle)
    root.set('prestress', prestress)
    const mesh = new Y.Map<number>()
    mesh.set('edgeLength', frame.mesh.edgeLength)
    root.set('mesh', mesh)
    const loops = new Y.Array<YLoop>()
    loops.push(
      frame.loops.map((l) =>
        makeLoop(
          l.role,
          l.points.map((p, i) => ({ ...p, edge: l.edges[i]?.kind ?? 'rigid', tension: l.edges[i]?.tension })),
        ),
      ),
    )
    root.set('loops', loops)
  }, origin)
}
