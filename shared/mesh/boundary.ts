/**
 * Resampling of frame loops into boundary vertices at a target spacing, shared by the plan and
 * parametric meshers.
 */
import type { Frame } from '../types'

export interface BoundarySamples {
  /** #B×3 positions, metres (z linear along each edge between frame points). */
  xyz: number[]
  loopOf: number[]
  edgeOf: number[]
  pointOf: number[]
  /** Per loop: indices into the samples, in the loop's point order. */
  loops: number[][]
}

/**
 * Split edge i of every loop into `divisions(loop, edge, planLength, length3d)` equal parts; every
 * frame point becomes a sample. Sample order = loop by loop, frame point order.
 */
export function resampleLoops(
  frame: Readonly<Frame>,
  divisions: (loop: number, edge: number, planLength: number, length3d: number) => number,
): BoundarySamples {
  const out: BoundarySamples = { xyz: [], loopOf: [], edgeOf: [], pointOf: [], loops: [] }
  frame.loops.forEach((loop, l) => {
    const idx: number[] = []
    const n = loop.points.length
    for (let i = 0; i < n; i++) {
      const p = loop.points[i]!
      const q = loop.points[(i + 1) % n]!
      const lp = Math.hypot(q.x - p.x, q.y - p.y)
      const m = Math.max(1, divisions(l, i, lp, Math.hypot(lp, q.z - p.z)))
      for (let k = 0; k < m; k++) {
        const t = k / m
        idx.push(out.loopOf.length)
        out.xyz.push(p.x + t * (q.x - p.x), p.y + t * (q.y - p.y), p.z + t * (q.z - p.z))
        out.loopOf.push(l)
        out.edgeOf.push(i)
        out.pointOf.push(k === 0 ? i : -1)
      }
    }
    out.loops.push(idx)
  })
  return out
}
