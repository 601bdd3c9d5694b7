/**
 * Splitting a triangle mesh along the zero set of a piecewise-linear field: the seam then runs along
 * mesh edges, so strips are plain sets of whole triangles.
 */
import { edgeKey } from './mesh-edges'
import type { TriangleMesh } from './types'

/** A crossing closer than this fraction of an edge to a vertex is moved onto the vertex (no slivers). */
const SNAP = 1e-3

/**
 * Splits `mesh` where `phi` (#V, one value per vertex) changes sign inside active triangles and
 * adds the new edges on phi = 0 to `seamEdges` (edge keys, updated in place as edges split).
 * active: #T flags, nonzero = this triangle may carry the seam (null = all); an inactive triangle
 * next to a split edge is subdivided too, so the mesh stays conforming. Vertices on a split edge
 * are interpolated linearly (exact on the piecewise-linear surface). Returns the new mesh; old
 * vertex indices are kept, new vertices are appended.
 */
export function splitByLevelSet(
  mesh: Readonly<TriangleMesh>,
  phi: Float64Array,
  active: Readonly<Uint8Array> | null,
  seamEdges: Set<number>,
): TriangleMesh {
  const { triangles } = mesh
  const count = triangles.length / 3
  const isActive = (t: number) => active === null || active[t] !== 0
  snapNearVertices(triangles, phi, isActive)
  const positions = Array.from(mesh.vertices)
  const midpoints = new Map<number, number>()
  const midpoint = (a: number, b: number): number => {
    const key = edgeKey(a, b)
    let m = midpoints.get(key)
    if (m !== undefined) return m
    const [p, q] = a < b ? [a, b] : [b, a]
    const s = phi[p]! / (phi[p]! - phi[q]!)
    m = positions.length / 3
    for (let d = 0; d < 3; d++)
      positions.push(positions[3 * p + d]! + s * (positions[3 * q + d]! - positions[3 * p + d]!))
    midpoints.set(key, m)
    if (seamEdges.delete(key)) seamEdges.add(edgeKey(a, m)).add(edgeKey(m, b))
    return m
  }
  const crosses = (a: number, b: number) => phi[a]! * phi[b]! < 0
  for (let t = 0; t < count; t++) {
    if (!isActive(t)) continue
    const v = [triangles[3 * t]!, triangles[3 * t + 1]!, triangles[3 * t + 2]!]
    const cuts: number[] = []
    for (let k = 0; k < 3; k++) {
      const a = v[k]!,
        b = v[(k + 1) % 3]!
      if (crosses(a, b)) cuts.push(midpoint(a, b))
      else if (phi[a] === 0 && phi[b] === 0 && phi[v[(k + 2) % 3]!] !== 0) seamEdges.add(edgeKey(a, b))
    }
    if (cuts.length === 2) seamEdges.add(edgeKey(cuts[0]!, cuts[1]!))
    else if (cuts.length === 1) {
      const zero = v.find((x) => phi[x] === 0)
      if (zero !== undefined) seamEdges.add(edgeKey(zero, cuts[0]!))
    }
  }
  const out: number[] = []
  for (let t = 0; t < count; t++)
    subdivide(out, triangles[3 * t]!, triangles[3 * t + 1]!, triangles[3 * t + 2]!, midpoints)
  return { vertices: new Float64Array(positions), triangles: new Uint32Array(out) }
}

/** Moves phi to 0 at a vertex when a crossing of an active triangle's edge lies within SNAP of it. */
function snapNearVertices(triangles: Readonly<Uint32Array>, phi: Float64Array, isActive: (t: number) => boolean): void {
  for (let t = 0; t < triangles.length / 3; t++) {
    if (!isActive(t)) continue
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k]!,
        b = triangles[3 * t + ((k + 1) % 3)]!
      if (!(phi[a]! * phi[b]! < 0)) continue
      const s = phi[a]! / (phi[a]! - phi[b]!)
      if (s < SNAP) phi[a] = 0
      else if (s > 1 - SNAP) phi[b] = 0
    }
  }
}

/** Appends triangle (a, b, c) cut at the midpoints that exist on its edges, keeping orientation. */
function subdivide(out: number[], a: number, b: number, c: number, midpoints: ReadonlyMap<number, number>): void {
  const mab = midpoints.get(edgeKey(a, b)) ?? -1
  const mbc = midpoints.get(edgeKey(b, c)) ?? -1
  const mca = midpoints.get(edgeKey(c, a)) ?? -1
  const split = (mab >= 0 ? 1 : 0) + (mbc >= 0 ? 1 : 0) + (mca >= 0 ? 1 : 0)
  if (split === 0) out.push(a, b, c)
  else if (split === 3) out.push(a, mab, mca, mab, b, mbc, mca, mbc, c, mab, mbc, mca)
  else if (split === 1) {
    // rotate so the split edge is (a, b)
    if (mbc >= 0) subdivide1(out, b, c, a, mbc)
    else if (mca >= 0) subdivide1(out, c, a, b, mca)
    else subdivide1(out, a, b, c, mab)
  } else {
    // rotate so the unsplit edge is (b, c): a is the lone corner
    if (mbc < 0) out.push(a, mab, mca, mab, b, c, mab, c, mca)
    else if (mca < 0) out.push(b, mbc, mab, mbc, c, a, mbc, a, mab)
    else out.push(c, mca, mbc, mca, a, b, mca, b, mbc)
  }
}

function subdivide1(out: number[], a: number, b: number, c: number, m: number): void {
  out.push(a, m, c, m, b, c)
}
