import { csrSlot, type SymmetricCsr } from './csr'

/**
 * The sparsity pattern of a vertex-based operator (stiffness, Hessian) on a triangle mesh, reduced
 * to the free (unknown) vertices, plus a per-triangle map into the value array so that assembly is a
 * plain scatter with no search.
 */
export interface TrianglePattern {
  matrix: SymmetricCsr
  /** #V Int32Array: row of each vertex in the reduced system, -1 for fixed vertices. */
  freeIndex: Int32Array
  /** #T×9 Int32Array: slot of the local pair (a, b) at 9t+3a+b, -1 if either vertex is fixed. */
  triangleSlots: Int32Array
}

/**
 * Builds the reduced pattern. triangles: #T×3 vertex indices; isFixed: #V, nonzero = fixed vertex.
 * Topology only: reuse the result while the mesh's topologyKey and the fixed set are unchanged.
 */
export function trianglePattern(
  vertexCount: number,
  triangles: Readonly<Uint32Array>,
  isFixed: Readonly<ArrayLike<number | boolean>>,
): TrianglePattern {
  const freeIndex = new Int32Array(vertexCount).fill(-1)
  let n = 0
  for (let v = 0; v < vertexCount; v++) if (!isFixed[v]) freeIndex[v] = n++
  // upper bound per row (each corner brings two neighbours, duplicates removed below) + diagonal
  const triangleCount = triangles.length / 3
  const bound = new Int32Array(n + 1)
  for (let t = 0; t < 3 * triangleCount; t++) {
    const f = freeIndex[triangles[t]!]!
    if (f >= 0) bound[f + 1]! += 2
  }
  for (let i = 0; i < n; i++) bound[i + 1]! += bound[i]! + 1
  const scratch = new Int32Array(bound[n]!)
  const used = new Int32Array(n)
  for (let i = 0; i < n; i++) scratch[bound[i]! + used[i]!++] = i
  for (let t = 0; t < triangleCount; t++) {
    for (let a = 0; a < 3; a++) {
      const fa = freeIndex[triangles[3 * t + a]!]!
      if (fa < 0) continue
      for (let b = 1; b < 3; b++) {
        const fb = freeIndex[triangles[3 * t + ((a + b) % 3)]!]!
        if (fb >= 0) scratch[bound[fa]! + used[fa]!++] = fb
      }
    }
  }
  const matrix = compactRows(n, bound, used, scratch)
  const triangleSlots = new Int32Array(9 * triangleCount).fill(-1)
  for (let t = 0; t < triangleCount; t++) {
    for (let a = 0; a < 3; a++) {
      const fa = freeIndex[triangles[3 * t + a]!]!
      if (fa < 0) continue
      for (let b = 0; b < 3; b++) {
        const fb = freeIndex[triangles[3 * t + b]!]!
        if (fb >= 0) triangleSlots[9 * t + 3 * a + b] = csrSlot(matrix, fa, fb)
      }
    }
  }
  return { matrix, freeIndex, triangleSlots }
}

/** Sorts and deduplicates each row segment (short rows: insertion sort) into a SymmetricCsr. */
function compactRows(n: number, bound: Int32Array, used: Int32Array, scratch: Int32Array): SymmetricCsr {
  const rowStart = new Int32Array(n + 1)
  for (let i = 0; i < n; i++) {
    const s = bound[i]!
    const e = s + used[i]!
    for (let p = s + 1; p < e; p++) {
      const c = scratch[p]!
      let q = p - 1
      while (q >= s && scratch[q]! > c) {
        scratch[q + 1] = scratch[q]!
        q--
      }
      scratch[q + 1] = c
    }
    let w = s
    for (let p = s; p < e; p++) if (p === s || scratch[p] !== scratch[p - 1]) scratch[w++] = scratch[p]!
    used[i] = w - s
    rowStart[i + 1] = rowStart[i]! + used[i]!
  }
  const columns = new Int32Array(rowStart[n]!)
  const diagonal = new Int32Array(n)
  for (let i = 0; i < n; i++) {
    const s = bound[i]!
    let p = rowStart[i]!
    for (let q = s; q < s + used[i]!; q++) {
      if (scratch[q] === i) diagonal[i] = p
      columns[p++] = scratch[q]!
    }
  }
  return {
    n,
    rowStart,
    columns,
    values: new Float64Array(columns.length),
    diagonal,
  }
}
