/** Undirected edge keys and edge → triangle adjacency for triangle meshes. */

/** Room for 2^26 vertices per index, so a key stays an exact double (< 2^53). */
const KEY_BASE = 67_108_864

/** Key of the undirected edge {a, b}. */
export function edgeKey(a: number, b: number): number {
  return a < b ? a * KEY_BASE + b : b * KEY_BASE + a
}

/** The two vertex indices of an edge key, smaller first. */
export function edgeEnds(key: number): [number, number] {
  const a = Math.floor(key / KEY_BASE)
  return [a, key - a * KEY_BASE]
}

/**
 * For every edge, the triangles on its sides. triangles: #T×3 Uint32Array.
 * Returns a map edge key → [first triangle, second triangle or -1]; a third triangle on one edge
 * (non-manifold input) is ignored, so that edge is treated as joining the first two.
 */
export function edgeTriangles(triangles: Readonly<Uint32Array>): Map<number, [number, number]> {
  const map = new Map<number, [number, number]>()
  const count = triangles.length / 3
  for (let t = 0; t < count; t++) {
    for (let k = 0; k < 3; k++) {
      const key = edgeKey(triangles[3 * t + k]!, triangles[3 * t + ((k + 1) % 3)]!)
      const sides = map.get(key)
      if (!sides) map.set(key, [t, -1])
      else if (sides[1] < 0) sides[1] = t
    }
  }
  return map
}

/** Boundary edges (one triangle only) as directed pairs in their triangle's direction: #b×2. */
export function directedBoundary(triangles: Readonly<Uint32Array>): Int32Array {
  const sides = edgeTriangles(triangles)
  const out: number[] = []
  for (let t = 0; t < triangles.length / 3; t++) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k]!,
        b = triangles[3 * t + ((k + 1) % 3)]!
      if (sides.get(edgeKey(a, b))![1] < 0) out.push(a, b)
    }
  }
  return Int32Array.from(out)
}
