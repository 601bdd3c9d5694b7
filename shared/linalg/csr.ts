/**
 * A sparse symmetric matrix in compressed sparse row form with BOTH triangles stored, so that row i
 * is also column i (the LDLᵀ factorisation reads columns, the mat-vec reads rows).
 * rowStart: (n+1) Int32Array; columns: nnz Int32Array, sorted within each row;
 * values: nnz Float64Array; diagonal: n Int32Array, the slot of entry (i, i) (every row has one).
 */
export interface SymmetricCsr {
  n: number
  rowStart: Int32Array
  columns: Int32Array
  values: Float64Array
  diagonal: Int32Array
}

/**
 * Builds the pattern from per-row neighbour lists (duplicates allowed, the diagonal is added).
 * rows: n lists of column indices; the caller must list (i, j) and (j, i) both. Values start at 0.
 */
export function csrFromRows(rows: Readonly<ArrayLike<number>[]>): SymmetricCsr {
  const n = rows.length
  const rowStart = new Int32Array(n + 1)
  const scratch: number[] = []
  const sortedRows: number[][] = new Array(n)
  for (let i = 0; i < n; i++) {
    scratch.length = 0
    scratch.push(i)
    const row = rows[i]!
    for (let k = 0; k < row.length; k++) scratch.push(row[k]!)
    scratch.sort((a, b) => a - b)
    const unique: number[] = []
    for (const c of scratch) if (unique.length === 0 || unique[unique.length - 1] !== c) unique.push(c)
    sortedRows[i] = unique
    rowStart[i + 1] = rowStart[i]! + unique.length
  }
  const columns = new Int32Array(rowStart[n]!)
  const diagonal = new Int32Array(n)
  for (let i = 0; i < n; i++) {
    let p = rowStart[i]!
    for (const c of sortedRows[i]!) {
      if (c === i) diagonal[i] = p
      columns[p++] = c
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

/** Slot of entry (i, j) in columns/values, or -1 when (i, j) is not in the pattern. */
export function csrSlot(a: Readonly<SymmetricCsr>, i: number, j: number): number {
  let lo = a.rowStart[i]!
  let hi = a.rowStart[i + 1]! - 1
  while (lo <= hi) {
    const mid = (lo + hi) >> 1
    const c = a.columns[mid]!
    if (c === j) return mid
    if (c < j) lo = mid + 1
    else hi = mid - 1
  }
  return -1
}

/** out = A·x. out, x: n Float64Array (out must not alias x). */
export function csrMultiply(out: Float64Array, a: Readonly<SymmetricCsr>, x: Readonly<Float64Array>): Float64Array {
  const { n, rowStart, columns, values } = a
  for (let i = 0; i < n; i++) {
    let sum = 0
    const end = rowStart[i + 1]!
    for (let p = rowStart[i]!; p < end; p++) sum += values[p]! * x[columns[p]!]!
    out[i] = sum
  }
  return out
}

/** A copy with the same pattern arrays shared and fresh values (for a second matrix on one pattern). */
export function csrWithSamePattern(a: Readonly<SymmetricCsr>): SymmetricCsr {
  return { ...a, values: new Float64Array(a.values.length) }
}
