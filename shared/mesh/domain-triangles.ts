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
  const stack = new Int32Array(nT)
  for (let e = 0; e < triangles.length; e++) {
    if (halfedges[e] !== -1) continue
    const t = (e / 3) | 0
    if (parity[t] !== -1) continue
    parity[t] = crossesLoop(triangles, nextOnLoop, e) ? 1 : 0
    let top = 0
    stack[top++] = t
    while (top > 0) {
      const u = stack[--top]!
      for (let e2 = 3 * u; e2 < 3 * u + 3; e2++) {
        const o = halfedges[e2]!
        if (o === -1) continue
        const w = (o / 3) | 0
        if (parity[w] !== -1) continue
        parity[w] = crossesLoop(triangles, nextOnLoop, e2) ? 1 - parity[u]! : parity[u]!
        stack[top++] = w
      }
    }
  }
  const keep: number[] = []
  for (let t = 0; t < nT; t++) if (parity[t] === 1) keep.push(t)
  return keep
}

/** Is half-edge e a boundary segment (its two ends consecutive on a loop)? */
function crossesLoop(triangles: Readonly<Uint32Array>, nextOnLoop: Readonly<Int32Array>, e: number): boolean {
  const p = triangles[e]!
  const q = triangles[e % 3 === 2 ? e - 2 : e + 1]!
  return nextOnLoop[p] === q || nextOnLoop[q] === p
}
