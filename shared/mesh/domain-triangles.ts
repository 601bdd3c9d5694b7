/**
 * Which triangles of a constrained Delaunay triangulation lie in the domain (outer loop minus
 * holes): walk across half-edges from the convex hull, flipping inside/outside at every boundary
 * segment (even–odd rule). O(#T).
 */

/**
 * triangles/halfedges: Delaunator arrays; nextOnLoop[p] = the vertex after p on its loop (−1 for
 * vertices not on a loop): boundary segments are the pairs (p, nextOnLoop[p]). Returns the indices
 * of domain triangles.
 */
export function domainTriangles(
  triangles: Readonly<Uint32Array>,
  halfedges: Readonly<Int32Array>,
  nextOnLoop: Readonly<Int32Array>,
): number[] {
  const nT = triangles.length / 3
  const parity = new Int8Array(nT).fill(-1)
  const isSegment = (e: number): boolean => {
    const p = triangles[e]!
    const q = triangles[e % 3 === 2 ? e - 2 : e + 1]!
    return nextOnLoop[p] === q || nextOnLoop[q] === p
  }
  const stack: number[] = []
  for (let e = 0; e < triangles.length; e++) {
    if (halfedges[e] !== -1) continue
    const t = Math.floor(e / 3)
    if (parity[t] !== -1) continue
    parity[t] = isSegment(e) ? 1 : 0
    stack.push(t)
    while (stack.length > 0) {
      const u = stack.pop()!
      for (let k = 0; k < 3; k++) {
        const e2 = 3 * u + k
        const o = halfedges[e2]!
        if (o === -1) continue
        const w = Math.floor(o / 3)
        if (parity[w] !== -1) continue
        parity[w] = isSegment(e2) ? 1 - parity[u]! : parity[u]!
        stack.push(w)
      }
    }
  }
  const keep: number[] = []
  for (let t = 0; t < nT; t++) if (parity[t] === 1) keep.push(t)
  return keep
}
