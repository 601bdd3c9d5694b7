import type { SymmetricCsr } from './csr'

/**
 * A vertex pattern expanded to several unknowns (degrees of freedom) per vertex: vertex v owns
 * dofCount[v] consecutive unknowns, and every vertex entry (v, u) becomes a dense block. Used by
 * the spatial solver, whose unknowns are displacements along 1 or 2 chosen directions per vertex.
 */
export interface DofPattern {
  matrix: SymmetricCsr
  /** n+1 Int32Array: first unknown of each vertex row. */
  dofStart: Int32Array
  /** Per slot s of the vertex pattern (row v, column u): offset of u's block within v's rows. */
  slotOffset: Int32Array
}

/** Expands `vertexMatrix` (pattern only) by dofCount (n Uint8Array, each ≥ 1). */
export function expandPattern(vertexMatrix: Readonly<SymmetricCsr>, dofCount: Readonly<Uint8Array>): DofPattern {
  const n = vertexMatrix.n
  const { rowStart: vStart, columns: vCols } = vertexMatrix
  const dofStart = new Int32Array(n + 1)
  for (let v = 0; v < n; v++) dofStart[v + 1] = dofStart[v]! + dofCount[v]!
  const total = dofStart[n]!
  const slotOffset = new Int32Array(vCols.length)
  const rowStart = new Int32Array(total + 1)
  for (let v = 0; v < n; v++) {
    let len = 0
    for (let s = vStart[v]!; s < vStart[v + 1]!; s++) {
      slotOffset[s] = len
      len += dofCount[vCols[s]!]!
    }
    for (let a = 0; a < dofCount[v]!; a++) {
      const row = dofStart[v]! + a
      rowStart[row + 1] = rowStart[row]! + len
    }
  }
  const columns = new Int32Array(rowStart[total]!)
  const diagonal = new Int32Array(total)
  for (let v = 0; v < n; v++) {
    for (let a = 0; a < dofCount[v]!; a++) {
      const row = dofStart[v]! + a
      let p = rowStart[row]!
      for (let s = vStart[v]!; s < vStart[v + 1]!; s++) {
        const u = vCols[s]!
        for (let b = 0; b < dofCount[u]!; b++) {
          if (u === v && b === a) diagonal[row] = p
          columns[p++] = dofStart[u]! + b
        }
      }
    }
  }
  return {
    matrix: {
      n: total,
      rowStart,
      columns,
      values: new Float64Array(columns.length),
      diagonal,
    },
    dofStart,
    slotOffset,
  }
}
