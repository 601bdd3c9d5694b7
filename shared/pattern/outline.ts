/** A strip's outline (its outer boundary loop) and the cut line offset from it along seams. */

/**
 * Chains directed boundary edges (#b×2, strip vertices) into closed loops of vertex indices.
 * Where a vertex starts two boundary edges (strip corners touching), the first unused one is taken.
 * Also returns, per loop, the index of each loop edge in boundaryEdges.
 */
export function boundaryLoops(boundaryEdges: Readonly<Int32Array>): { loops: number[][]; edges: number[][] } {
  const next = new Map<number, number[]>()
  for (let e = 0; e < boundaryEdges.length / 2; e++) {
    const a = boundaryEdges[2 * e]!
    const list = next.get(a)
    if (list) list.push(e)
    else next.set(a, [e])
  }
  const used = new Uint8Array(boundaryEdges.length / 2)
  const loops: number[][] = []
  const edges: number[][] = []
  for (let start = 0; start < used.length; start++) {
    if (used[start]) continue
    const loop: number[] = []
    const loopEdges: number[] = []
    let e = start
    while (e >= 0 && !used[e]) {
      used[e] = 1
      loop.push(boundaryEdges[2 * e]!)
      loopEdges.push(e)
      const candidates = next.get(boundaryEdges[2 * e + 1]!) ?? []
      e = candidates.find((c) => !used[c]) ?? -1
    }
    loops.push(loop)
    edges.push(loopEdges)
  }
  return { loops, edges }
}

/** Signed area of a closed polygon [[u, v]…], positive counter-clockwise (shoelace). */
export function polygonArea(points: readonly (readonly [number, number])[]): number {
  let sum = 0
  for (let i = 0; i < points.length; i++) {
    const p = points[i]!,
      q = points[(i + 1) % points.length]!
    sum += p[0] * q[1] - q[0] * p[1]
  }
  return sum / 2
}

/** A miter longer than this many offsets is cut back (a sharp corner would shoot out). */
const MITER_LIMIT = 4

/**
 * Offsets a counter-clockwise polygon outward, edge i (points i → i+1) by distances[i] (m, ≥ 0).
 * Each corner is the meeting point of its two offset edges (a miter), limited to MITER_LIMIT
 * offsets from the corner; parallel neighbours move along their common normal. Known limit: an
 * offset larger than a concave detail may make the line cross itself.
 */
export function offsetPolygon(
  points: readonly (readonly [number, number])[],
  distances: readonly number[],
): [number, number][] {
  const n = points.length
  const normals: [number, number][] = []
  for (let i = 0; i < n; i++) {
    const p = points[i]!,
      q = points[(i + 1) % n]!
    const dx = q[0] - p[0],
      dy = q[1] - p[1]
    const len = Math.hypot(dx, dy) || 1
    normals.push([dy / len, -dx / len]) // outward for counter-clockwise
  }
  const out: [number, number][] = []
  for (let i = 0; i < n; i++) {
    const prev = (i + n - 1) % n
    const d0 = distances[prev]!,
      d1 = distances[i]!
    const n0 = normals[prev]!,
      n1 = normals[i]!
    const p = points[i]!
    if (d0 === 0 && d1 === 0) {
      out.push([p[0], p[1]])
      continue
    }
    // solve n0·x = d0, n1·x = d1 for the corner's shift x
    const det = n0[0] * n1[1] - n0[1] * n1[0]
    let sx: number, sy: number
    if (Math.abs(det) < 1e-9) {
      const d = Math.max(d0, d1)
      sx = n1[0] * d
      sy = n1[1] * d
    } else {
      sx = (d0 * n1[1] - d1 * n0[1]) / det
      sy = (n0[0] * d1 - n1[0] * d0) / det
    }
    const limit = MITER_LIMIT * Math.max(d0, d1)
    const len = Math.hypot(sx, sy)
    if (len > limit) {
      sx *= limit / len
      sy *= limit / len
    }
    out.push([p[0] + sx, p[1] + sy])
  }
  return out
}
