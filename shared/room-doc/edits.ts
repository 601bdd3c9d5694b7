/**
 * Edits of the room document. Each runs in one transaction so that it is one undo step and one
 * update on the wire. Loops and points are addressed by id, never by index, because indices shift
 * under concurrent inserts and deletes. Parts of a malformed document (a number where a loop's map
 * should be: see read.ts) are never found, so an edit there is refused rather than thrown.
 */
import * as Y from 'yjs'
import type { EdgeKind } from '../types'
import { loopsArray, mapsIn } from './read'
import { frameMap, makeLoop, makePoint, type YLoop, type YPoint } from './schema'

/** Finds a loop by id, or undefined when a peer removed it. */
export function findLoop(doc: Y.Doc, loopId: string): YLoop | undefined {
  return mapsIn(loopsArray(doc)).find((l) => l.get('id') === loopId) as YLoop | undefined
}

/** The points array of a loop, or undefined when it is missing or not a Y.Array. */
export function pointsOf(loop: YLoop): Y.Array<YPoint> | undefined {
  const points = loop.get('points')
  return points instanceof Y.Array ? points : undefined
}

/** Finds a point and its current index, or undefined when it was deleted. */
export function findPoint(doc: Y.Doc, loopId: string, pointId: string): { point: YPoint; index: number } | undefined {
  const loop = findLoop(doc, loopId)
  const arr = loop ? ((pointsOf(loop)?.toArray() ?? []) as unknown[]) : []
  const index = arr.findIndex((p) => p instanceof Y.Map && p.get('id') === pointId)
  const point = arr[index] as YPoint | undefined
  return point ? { point, index } : undefined
}

/** Moves a frame point (any of x, y, z in metres). Returns false when the point no longer exists. */
export function movePoint(
  doc: Y.Doc,
  loopId: string,
  pointId: string,
  to: { x?: number; y?: number; z?: number },
  origin?: unknown,
): boolean {
  const found = findPoint(doc, loopId, pointId)
  if (!found) return false
  doc.transact(() => {
    for (const key of ['x', 'y', 'z'] as const) {
      const v = to[key]
      if (v !== undefined) found.point.set(key, v)
    }
  }, origin)
  return true
}

/** Inserts a point after `afterPointId` (on the edge that starts there); the new point inherits that edge. */
export function insertPointAfter(
  doc: Y.Doc,
  loopId: string,
  afterPointId: string,
  at: { x: number; y: number; z: number },
  origin?: unknown,
): string | undefined {
  const found = findPoint(doc, loopId, afterPointId)
  const points = findLoop(doc, loopId)
  const arr = points && pointsOf(points)
  if (!found || !arr) return undefined
  const edge = (found.point.get('edge') as EdgeKind | undefined) ?? 'rigid'
  const tension = found.point.get('tension') as number | undefined
  const point = makePoint({ ...at, edge, tension })
  doc.transact(() => arr.insert(found.index + 1, [point]), origin)
  return point.get('id') as string
}

/** Deletes a point; refuses to leave a loop with fewer than three points. */
export function deletePoint(doc: Y.Doc, loopId: string, pointId: string, origin?: unknown): boolean {
  const found = findPoint(doc, loopId, pointId)
  const loop = findLoop(doc, loopId)
  const arr = loop && pointsOf(loop)
  if (!found || !arr || arr.length <= 3) return false
  doc.transact(() => arr.delete(found.index, 1), origin)
  return true
}

/** Sets the kind of the edge that starts at a point, and its tension in kN for a cable. */
export function setEdge(
  doc: Y.Doc,
  loopId: string,
  pointId: string,
  kind: EdgeKind,
  tension?: number,
  origin?: unknown,
): boolean {
  const found = findPoint(doc, loopId, pointId)
  if (!found) return false
  doc.transact(() => {
    found.point.set('edge', kind)
    if (kind === 'cable' && tension !== undefined) found.point.set('tension', tension)
    if (kind === 'rigid') found.point.delete('tension')
  }, origin)
  return true
}

/** Adds a hole loop (mast ring, oculus) and returns its id; undefined when the frame has no loops list. */
export function addHole(
  doc: Y.Doc,
  points: { x: number; y: number; z: number }[],
  origin?: unknown,
): string | undefined {
  const loops = loopsArray(doc)
  if (!loops) return undefined
  const loop = makeLoop('hole', points)
  doc.transact(() => loops.push([loop]), origin)
  return loop.get('id') as string
}

/** Removes a hole loop; the outer loop cannot be removed. */
export function removeHole(doc: Y.Doc, loopId: string, origin?: unknown): boolean {
  const loops = loopsArray(doc)
  const index = loops
    ? loops.toArray().findIndex((l) => l instanceof Y.Map && l.get('id') === loopId && l.get('role') === 'hole')
    : -1
  if (!loops || index < 0) return false
  doc.transact(() => loops.delete(index, 1), origin)
  return true
}

/** Sets the membrane prestress (kN/m), the warp direction (degrees from +x) and/or the element size (m). */
export function setSettings(
  doc: Y.Doc,
  settings: { warp?: number; fill?: number; warpAngle?: number; edgeLength?: number },
  origin?: unknown,
): void {
  doc.transact(() => {
    const root = frameMap(doc)
    const prestress = root.get('prestress')
    const mesh = root.get('mesh')
    if (prestress instanceof Y.Map) {
      if (settings.warp !== undefined) prestress.set('warp', settings.warp)
      if (settings.fill !== undefined) prestress.set('fill', settings.fill)
      if (settings.warpAngle !== undefined) prestress.set('warpAngle', settings.warpAngle)
    }
    if (mesh instanceof Y.Map && settings.edgeLength !== undefined) mesh.set('edgeLength', settings.edgeLength)
  }, origin)
}
