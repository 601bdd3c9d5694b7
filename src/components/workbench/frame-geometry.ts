/**
 * Frame → line geometry for the viewport. Rigid and cable edges go to separate segment lists so
 * the viewport can draw them with a solid and a dashed material. Points with a non-finite
 * coordinate (a bad value in the document) are skipped together with their edges, so one bad
 * number never breaks the whole drawing.
 */
import type { FrameView, ViewPoint } from '../../lib/frame-view'

type XYZ = { x: number; y: number; z: number }

/** One frame edge: the point it starts at and its two ends (m). */
export interface FrameSegment {
  loopId: string
  /** The edge starts at this point (edge data is stored on its start point). */
  pointId: string
  kind: 'rigid' | 'cable'
  a: XYZ
  b: XYZ
}

export interface FrameLines {
  /** #S×2×3 segment end positions (m) of rigid edges, for LineSegments. */
  rigid: Float32Array
  /** #S×2×3 segment end positions (m) of cable edges. */
  cable: Float32Array
  segments: FrameSegment[]
}

const finite = (p: ViewPoint): boolean => Number.isFinite(p.x) && Number.isFinite(p.y) && Number.isFinite(p.z)

/** Lists the edges of every loop (the last point joins the first) and packs their positions. */
export function frameLines(view: Readonly<FrameView>): FrameLines {
  const segments: FrameSegment[] = []
  for (const loop of view.loops) {
    const n = loop.points.length
    if (n < 2) continue
    loop.points.forEach((p, i) => {
      const q = loop.points[(i + 1) % n]!
      if (!finite(p) || !finite(q)) return
      segments.push({
        loopId: loop.id,
        pointId: p.id,
        kind: p.edge,
        a: { x: p.x, y: p.y, z: p.z },
        b: { x: q.x, y: q.y, z: q.z },
      })
    })
  }
  const pack = (kind: 'rigid' | 'cable'): Float32Array => {
    const list = segments.filter((s) => s.kind === kind)
    const out = new Float32Array(list.length * 6)
    list.forEach((s, i) => out.set([s.a.x, s.a.y, s.a.z, s.b.x, s.b.y, s.b.z], i * 6))
    return out
  }
  return { rigid: pack('rigid'), cable: pack('cable'), segments }
}

/** Frame points with finite coordinates, with their loop ids, for handles. */
export function framePoints(view: Readonly<FrameView>): { loopId: string; point: ViewPoint }[] {
  return view.loops.flatMap((l) => l.points.filter(finite).map((point) => ({ loopId: l.id, point })))
}

/** Plan bounding box of the frame (m), or a 10 m square at the origin for an empty frame. */
export function frameBounds(view: Readonly<FrameView>): { min: XYZ; max: XYZ } {
  const pts = framePoints(view).map((p) => p.point)
  if (pts.length === 0) return { min: { x: 0, y: 0, z: 0 }, max: { x: 10, y: 10, z: 0 } }
  const min = { x: Infinity, y: Infinity, z: Infinity }
  const max = { x: -Infinity, y: -Infinity, z: -Infinity }
  for (const p of pts) {
    for (const k of ['x', 'y', 'z'] as const) {
      min[k] = Math.min(min[k], p[k])
      max[k] = Math.max(max[k], p[k])
    }
  }
  return { min, max }
}
