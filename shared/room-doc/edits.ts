/**
 * Edits of the room document. Each runs in one transaction so that it is one undo step and one
 * update on the wire. Loops and points are addressed by id, never by index, because indices shift
 * under concurrent inserts and deletes.
 */
import * as Y from 'yjs'
import type { EdgeKind } from '../types'
import { frameMap, loopsOf, makeLoop, makePoint, type YLoop, type YPoint } from './schema'

/** Finds a loop by id, or undefined when a peer removed it. */
export function findLoop(doc: Y.Doc, loopId: string): YLoop | undefined {
  return loopsOf(doc).toArray().find((l) => l.get('id') === loopId)
}

/** The points array of a loop. */
export function pointsOf(loop: YLoop): Y.Array<YPoint> {
  return loop.get('points') as Y.Array<YPoint>
}

/** Finds a point and its current index, or undefined when it was deleted. */
export function findPoint(doc: Y.Doc, loopId: string, pointId: string): { point: YPoint; index: number } | undefined {
  const loop = findLoop(doc, loopId)
  if (!loop) return undefined
  const arr = pointsOf(loop).toArray()
  const index = arr.findIndex((p) => p.get('id') === pointId)
  const point = arr[index]
  return point ? { point, index } : undefined
}

/** Moves a frame point (any of x, y, z in metres). Returns false when the point no longer exists. */
export function movePoint(doc: Y.Doc, loopId: string, pointId: string, to: { x?: number; y?: number; z?: number }, origin?: unknown): boolean {
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
export function insertPointAfter(doc: Y.Doc, loopId: string, afterPointId: string, at: { x: number; y: number; z: number }, origin?: unknown): string | undefined {
  const found = findPoint(doc, loopId, afterPointId)
  const loop = findLoop(doc, loopId)
  if (!found || !loop) return undefined
  const edge = (found.point.get('edge') as EdgeKind | undefined) ?? 'rigid'
  const tension = found.point.get('tension') as number | undefined
  const point = makePoint({ ...at, edge, tension })
  doc.transact(() => pointsOf(loop).insert(found.index + 1, [point]), origin)
  return point.get('id') as string
}

/** Deletes a point; refuses to leave a loop with fewer than three points. */
export function deletePoint(doc: Y.Doc, loopId: string, pointId: string, origin?: unknown): boolean {
  const found = findPoint(doc, loopId, pointId)
  const loop = findLoop(doc, loopId)
  if (!found || !loop || pointsOf(loop).length <= 3) return false
  doc.transact(() => pointsOf(loop).delete(found.index, 1), origin)
  return true
}

/** Sets the kind of the edge that starts at a point, and its tension in kN for a cable. */
export function setEdge(doc: Y.Doc, loopId: string, pointId: string, kind: EdgeKind, tension?: number, origin?: unknown): boolean {
  const found = findPoint(doc, loopId, pointId)
  if (!found) return false
  doc.transact(() => {
    found.point.set('edge', kind)
    if (kind === 'cable' && tension !== undefined) found.point.set('tension', tension)
    if (kind === 'rigid') found.point.delete('tension')
  }, origin)
  return true
}

/** Adds a hole loop (mast ring, oculus) and returns its id. */
export function addHole(doc: Y.Doc, points: { x: number; y: number; z: number }[], origin?: unknown): string {
  const loop = makeLoop('hole', points)
  doc.transact(() => loopsOf(doc).push([loop]), origin)
  return loop.get('id') as string
}

/** Removes a hole loop; the outer loop cannot be removed. */
export function removeHole(doc: Y.Doc, loopId: string, origin?: unknown): boolean {
  const loops = loopsOf(doc)
  const index = loops.toArray().findIndex((l) => l.get('id') === loopId && l.get('role') === 'hole')
  if (index < 0) return false
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
    const prestress = root.get('prestress') as Y.Map<number> | undefined
    const mesh = root.get('mesh') as Y.Map<number> | undefined
    if (settings.warp !== undefined) prestress?.set('warp', settings.warp)
    if (settings.fill !== undefined) prestress?.set('fill', settings.fill)
    if (settings.warpAngle !== undefined) prestress?.set('warpAngle', settings.warpAngle)
    if (settings.edgeLength !== undefined) mesh?.set('edgeLength', settings.edgeLength)
  }, origin)
}
