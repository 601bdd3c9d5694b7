import { EPSILON } from './constants'
import type { SymmetricCsr } from './csr'

/**
 * Sparse LDLᵀ of a symmetric positive definite matrix, split as in T. A. Davis, "Direct Methods for
 * Sparse Linear Systems" (SIAM 2006) and his LDL package: a symbolic analysis (elimination tree and
 * column counts of L, from the pattern only) reused for every matrix with the same pattern and
 * ordering, and an up-looking numeric factorisation (row k of L from a sparse triangular solve).
 */
export interface LdlSymbolic {
  n: number
  /** perm[k] = original index of pivot k; permInverse is its inverse. */
  perm: Int32Array
  permInverse: Int32Array
  /** Elimination tree: parent of column k, -1 for roots. */
  parent: Int32Array
  /** Start of each column of L in rows/values, length n+1 (strictly lower part, unit diagonal implied). */
  columnStart: Int32Array
}

export interface LdlFactor {
  symbolic: LdlSymbolic
  /** Row indices (permuted numbering) and values of the strictly lower part of L, column by column. */
  rows: Int32Array
  values: Float64Array
  /** The diagonal D, n Float64Array. */
  diagonal: Float64Array
}

/** Thrown when a pivot is not positive (the matrix is singular or not positive definite). */
export class NotPositiveDefiniteError extends Error {
  constructor(readonly column: number) {
    super(`LDLᵀ pivot ${column} is not positive: matrix singular or not positive definite`)
  }
}

/** Elimination tree and column counts of L for A permuted by perm (perm[k] = original index). */
export function ldlSymbolic(a: Readonly<SymmetricCsr>, perm: Readonly<Int32Array>): LdlSymbolic {
  const n = a.n
  const permInverse = new Int32Array(n)
  for (let k = 0; k < n; k++) permInverse[perm[k]!] = k
  const parent = new Int32Array(n)
  const flag = new Int32Array(n)
  const counts = new Int32Array(n)
  for (let k = 0; k < n; k++) {
    parent[k] = -1
    flag[k] = k
    const kk = perm[k]!
    for (let p = a.rowStart[kk]!; p < a.rowStart[kk + 1]!; p++) {
      // walk up the tree from each entry of row k to the first node already reached by row k
      for (let i = permInverse[a.columns[p]!]!; i < k && flag[i] !== k; i = parent[i]!) {
        if (parent[i] === -1) parent[i] = k
        counts[i]!++
        flag[i] = k
      }
    }
  }
  const columnStart = new Int32Array(n + 1)
  for (let k = 0; k < n; k++) columnStart[k + 1] = columnStart[k]! + counts[k]!
  return { n, perm: Int32Array.from(perm), permInverse, parent, columnStart }
}

/** Numeric workspace reused between factorisations of matrices with one symbolic analysis. */
const workspaces = new WeakMap<
  LdlSymbolic,
  { y: Float64Array; pattern: Int32Array; flag: Int32Array; fill: Int32Array }
>()

/**
 * Numeric LDLᵀ of A (same pattern as analysed). Writes into `into` when given (no allocation).
 * Throws NotPositiveDefiniteError when a pivot ≤ EPSILON × the largest diagonal entry.
 */
export function ldlFactor(a: Readonly<SymmetricCsr>, symbolic: LdlSymbolic, into?: LdlFactor): LdlFactor {
  const { n, perm, permInverse, parent, columnStart } = symbolic
  const nnz = columnStart[n]!
  const factor: LdlFactor = into ?? {
    symbolic,
    rows: new Int32Array(nnz),
    values: new Float64Array(nnz),
    diagonal: new Float64Array(n),
  }
  let work = workspaces.get(symbolic)
  if (!work) {
    work = {
      y: new Float64Array(n),
      pattern: new Int32Array(n),
      flag: new Int32Array(n),
      fill: new Int32Array(n),
    }
    workspaces.set(symbolic, work)
  }
  const { y, pattern, flag, fill } = work
  const { rows: li, values: lx, diagonal: d } = factor
  const { rowStart, columns, values: ax } = a
  let largest = 0
  for (let i = 0; i < n; i++) largest = Math.max(largest, Math.abs(ax[a.diagonal[i]!]!))
  const threshold = EPSILON * largest
  for (let k = 0; k < n; k++) {
    // nonzero pattern of row k of L = reach of the entries of A's row k in the elimination tree
    y[k] = 0
    let top = n
    flag[k] = k
    fill[k] = 0
    const kk = perm[k]!
    for (let p = rowStart[kk]!; p < rowStart[kk + 1]!; p++) {
      let i = permInverse[columns[p]!]!
      if (i > k) continue
      y[i]! += ax[p]!
      let len = 0
      for (; flag[i] !== k; i = parent[i]!) {
        pattern[len++] = i
        flag[i] = k
      }
      while (len > 0) pattern[--top] = pattern[--len]!
    }
    let dk = y[k]!
    y[k] = 0
    for (; top < n; top++) {
      const i = pattern[top]!
      const yi = y[i]!
      y[i] = 0
      const start = columnStart[i]!
      const end = start + fill[i]!
      for (let p = start; p < end; p++) y[li[p]!]! -= lx[p]! * yi
      const lki = yi / d[i]!
      dk -= lki * yi
      li[end] = k
      lx[end] = lki
      fill[i]!++
    }
    if (!(dk > threshold)) throw new NotPositiveDefiniteError(k)
    d[k] = dk
  }
  return factor
}

/** out = A⁻¹ b using the factor. out, b: n Float64Array (may alias). */
export function ldlSolve(out: Float64Array, factor: Readonly<LdlFactor>, b: Readonly<Float64Array>): Float64Array {
  const { n, perm, columnStart } = factor.symbolic
  const { rows: li, values: lx, diagonal: d } = factor
  const x = scratchFor(factor.symbolic)
  for (let k = 0; k < n; k++) x[k] = b[perm[k]!]!
  for (let j = 0; j < n; j++) {
    const xj = x[j]!
    if (xj === 0) continue
    for (let p = columnStart[j]!; p < columnStart[j + 1]!; p++) x[li[p]!]! -= lx[p]! * xj
  }
  for (let j = 0; j < n; j++) x[j]! /= d[j]!
  for (let j = n - 1; j >= 0; j--) {
    let xj = x[j]!
    for (let p = columnStart[j]!; p < columnStart[j + 1]!; p++) xj -= lx[p]! * x[li[p]!]!
    x[j] = xj
  }
  for (let k = 0; k < n; k++) out[perm[k]!] = x[k]!
  return out
}

const scratches = new WeakMap<LdlSymbolic, Float64Array>()
function scratchFor(symbolic: LdlSymbolic): Float64Array {
  let s = scratches.get(symbolic)
  if (!s) {
    s = new Float64Array(symbolic.n)
    scratches.set(symbolic, s)
  }
  return s
}
