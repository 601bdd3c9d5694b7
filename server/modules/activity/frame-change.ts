/**
 * Says in a few words what one edit did to a frame ("moved Outer P4", "added a hole"), for the
 * rooms list's "Last change". Reads the raw frames of the room document before and after the edit;
 * a member may have written anything there, so every value is checked before it is compared.
 */
import { edgeName, loopNames, pointName } from '../../../shared/report/numbering.js'

interface Loop {
  role: 'outer' | 'hole'
  points: { id: unknown; x: unknown; y: unknown; z: unknown }[]
  edges: { kind?: unknown; tension?: unknown }[]
}
interface Shape {
  loops: Loop[]
  prestress: unknown
  mesh: unknown
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null

function shapeOf(raw: unknown): Shape | null {
  if (!isObject(raw) || !Array.isArray(raw.loops)) return null
  const loops: Loop[] = []
  for (const l of raw.loops as unknown[]) {
    if (!isObject(l) || !Array.isArray(l.points)) return null
    const points = (l.points as unknown[]).filter(isObject).map((p) => ({ id: p.id, x: p.x, y: p.y, z: p.z }))
    const edges = Array.isArray(l.edges) ? (l.edges as unknown[]).filter(isObject) : []
    loops.push({ role: l.role === 'hole' ? 'hole' : 'outer', points, edges })
  }
  return { loops, prestress: raw.prestress, mesh: raw.mesh }
}

const same = (a: unknown, b: unknown): boolean => JSON.stringify(a) === JSON.stringify(b)

/** What the edit from `before` to `after` did, as a verb phrase; "edited the frame" when unclear. */
export function describeFrameChange(before: unknown, after: unknown): string {
  const a = shapeOf(before)
  const b = shapeOf(after)
  if (!a || !b) return 'edited the frame'
  if (b.loops.length > a.loops.length) return 'added a hole'
  if (b.loops.length < a.loops.length) return 'removed a hole'
  const idsA = new Set(a.loops.flatMap((l) => l.points.map((p) => p.id)))
  if (b.loops.length > 0 && b.loops.every((l) => l.points.every((p) => !idsA.has(p.id)))) return 'replaced the frame'
  const names = loopNames(b.loops)
  const moved: string[] = []
  const raised: string[] = []
  const edges: string[] = []
  for (const [i, lb] of b.loops.entries()) {
    const la = a.loops[i]!
    const name = names[i]!
    if (lb.points.length > la.points.length) return `added a point to ${name}`
    if (lb.points.length < la.points.length) return `removed a point from ${name}`
    lb.points.forEach((p, j) => {
      const q = la.points[j]!
      if (p.id !== q.id) return moved.push(pointName(name, j))
      if (p.x !== q.x || p.y !== q.y) moved.push(pointName(name, j))
      else if (p.z !== q.z) raised.push(pointName(name, j))
    })
    lb.edges.forEach((e, j) => {
      if (!same(e, la.edges[j])) edges.push(edgeName(name, j))
    })
  }
  const shifted = moved.length + raised.length
  if (shifted === 1) return moved[0] ? `moved ${moved[0]}` : `changed the height of ${raised[0]}`
  if (shifted > 1) return `moved ${shifted} points`
  if (edges.length === 1) return `changed edge ${edges[0]}`
  if (edges.length > 1) return `changed ${edges.length} edges`
  if (!same(a.prestress, b.prestress)) return 'changed the prestress'
  if (!same(a.mesh, b.mesh)) return 'changed the element size'
  return 'edited the frame'
}
