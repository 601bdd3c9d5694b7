import { describe, expect, it } from 'vitest'
import {
  conjugateGradients,
  csrFromRows,
  csrMultiply,
  ldlFactor,
  ldlSolve,
  ldlSymbolic,
  minimumDegreeOrdering,
  nestedDissectionOrdering,
  NotPositiveDefiniteError,
  type SymmetricCsr,
} from '../../shared/linalg'

/** Deterministic generator (mulberry32) so failures reproduce. */
function random(seed: number): () => number {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Random sparse SPD matrix: a weighted graph Laplacian plus a positive diagonal (diagonally dominant). */
function randomSpd(n: number, edges: number, seed: number): { a: SymmetricCsr; dense: number[][] } {
  const rnd = random(seed)
  const dense = Array.from({ length: n }, () => new Array<number>(n).fill(0))
  for (let e = 0; e < edges; e++) {
    const i = Math.floor(rnd() * n),
      j = Math.floor(rnd() * n)
    if (i === j) continue
    const w = 0.1 + rnd()
    dense[i]![j]! -= w
    dense[j]![i]! -= w
    dense[i]![i]! += w
    dense[j]![j]! += w
  }
  for (let i = 0; i < n; i++) dense[i]![i]! += 0.01 + rnd()
  return { a: fromDense(dense), dense }
}

function fromDense(dense: number[][]): SymmetricCsr {
  const rows = dense.map((row, i) => row.flatMap((v, j) => (v !== 0 && j !== i ? [j] : [])))
  const a = csrFromRows(rows)
  for (let i = 0; i < a.n; i++)
    for (let p = a.rowStart[i]!; p < a.rowStart[i + 1]!; p++) a.values[p] = dense[i]![a.columns[p]!]!
  return a
}

/** Dense Gaussian elimination with partial pivoting: the independent reference. */
function denseSolve(m: number[][], b: number[]): number[] {
  const n = b.length
  const a = m.map((row, i) => [...row, b[i]!])
  for (let k = 0; k < n; k++) {
    let piv = k
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i]![k]!) > Math.abs(a[piv]![k]!)) piv = i
    ;[a[k], a[piv]] = [a[piv]!, a[k]!]
    for (let i = k + 1; i < n; i++) {
      const f = a[i]![k]! / a[k]![k]!
      for (let j = k; j <= n; j++) a[i]![j]! -= f * a[k]![j]!
    }
  }
  const x = new Array<number>(n).fill(0)
  for (let i = n - 1; i >= 0; i--) {
    let s = a[i]![n]!
    for (let j = i + 1; j < n; j++) s -= a[i]![j]! * x[j]!
    x[i] = s / a[i]![i]!
  }
  return x
}

/** 5-point Laplacian on an m×m grid, natural (row-by-row) numbering. */
function gridLaplacian(m: number): SymmetricCsr {
  const rows: number[][] = []
  for (let j = 0; j < m; j++)
    for (let i = 0; i < m; i++) {
      const r: number[] = []
      if (i > 0) r.push(j * m + i - 1)
      if (i < m - 1) r.push(j * m + i + 1)
      if (j > 0) r.push((j - 1) * m + i)
      if (j < m - 1) r.push((j + 1) * m + i)
      rows.push(r)
    }
  const a = csrFromRows(rows)
  for (let i = 0; i < a.n; i++)
    for (let p = a.rowStart[i]!; p < a.rowStart[i + 1]!; p++) a.values[p] = a.columns[p] === i ? 4 : -1
  return a
}

describe('sparse LDLᵀ', () => {
  it('matches dense Gaussian elimination on random sparse SPD matrices', () => {
    for (const seed of [1, 2, 3, 4, 5]) {
      const n = 60
      const { a, dense } = randomSpd(n, 150, seed)
      const rnd = random(seed + 100)
      const b = Float64Array.from({ length: n }, () => rnd() - 0.5)
      const symbolic = ldlSymbolic(a, minimumDegreeOrdering(a))
      const x = ldlSolve(new Float64Array(n), ldlFactor(a, symbolic), b)
      const reference = denseSolve(dense, [...b])
      // reference: textbook Gaussian elimination; agreement to rounding for well-conditioned matrices
      for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(reference[i]!, 10)
    }
  })

  it('refactors new values on the same symbolic analysis', () => {
    const { a } = randomSpd(40, 100, 9)
    const symbolic = ldlSymbolic(a, minimumDegreeOrdering(a))
    const factor = ldlFactor(a, symbolic)
    for (let i = 0; i < a.n; i++) a.values[a.diagonal[i]!]! *= 2
    ldlFactor(a, symbolic, factor)
    const b = new Float64Array(a.n).fill(1)
    const x = ldlSolve(new Float64Array(a.n), factor, b)
    const ax = csrMultiply(new Float64Array(a.n), a, x)
    for (let i = 0; i < a.n; i++) expect(ax[i]).toBeCloseTo(1, 10)
  })

  it('rejects an indefinite matrix with a named pivot', () => {
    const a = fromDense([
      [1, 2],
      [2, 1],
    ])
    const symbolic = ldlSymbolic(a, Int32Array.from([0, 1]))
    expect(() => ldlFactor(a, symbolic)).toThrow(NotPositiveDefiniteError)
  })
})

describe('minimum degree ordering', () => {
  it('is a permutation and gives less fill than the natural order on a grid Laplacian', () => {
    const a = gridLaplacian(40)
    const perm = minimumDegreeOrdering(a)
    expect(new Set(perm).size).toBe(a.n)
    const natural = ldlSymbolic(
      a,
      Int32Array.from({ length: a.n }, (_, i) => i),
    ).columnStart[a.n]!
    const ordered = ldlSymbolic(a, perm).columnStart[a.n]!
    // natural order of an m×m grid fills the band: about m³ = 64000 entries; minimum degree is
    // O(m² log m) in practice (George & Liu, "Computer Solution of Large Sparse Positive Definite
    // Systems", 1981) — a factor of several smaller at m = 40
    expect(natural).toBeGreaterThan(60_000)
    expect(ordered).toBeLessThan(natural / 3)
  })
})

describe('nested dissection ordering', () => {
  it('is a permutation, factors correctly and fills less than the natural order on a grid', () => {
    const m = 40
    const a = gridLaplacian(m)
    const xyz = new Float64Array(3 * a.n)
    for (let k = 0; k < a.n; k++) xyz.set([k % m, Math.floor(k / m), 0], 3 * k)
    const perm = nestedDissectionOrdering(a, xyz)
    expect(new Set(perm).size).toBe(a.n)
    const natural = ldlSymbolic(
      a,
      Int32Array.from({ length: a.n }, (_, i) => i),
    ).columnStart[a.n]!
    const symbolic = ldlSymbolic(a, perm)
    // George (1973): nested dissection of an m×m grid fills O(m² log m) against the band's ≈ m³;
    // at m = 40 that is already less than half (measured 27.8k against 62.4k)
    expect(symbolic.columnStart[a.n]!).toBeLessThan(natural / 2)
    const b = Float64Array.from({ length: a.n }, (_, i) => Math.sin(i))
    const x = ldlSolve(new Float64Array(a.n), ldlFactor(a, symbolic), b)
    const ax = csrMultiply(new Float64Array(a.n), a, x)
    for (let i = 0; i < a.n; i++) expect(ax[i]).toBeCloseTo(b[i]!, 10)
  })
})

describe('preconditioned conjugate gradients', () => {
  it('solves with an older factor as preconditioner in a few iterations', () => {
    const a = gridLaplacian(30)
    const symbolic = ldlSymbolic(a, minimumDegreeOrdering(a))
    const factor = ldlFactor(a, symbolic)
    const rnd = random(7)
    // a later matrix on the same pattern: the diagonal raised by up to 5 %
    for (let i = 0; i < a.n; i++) a.values[a.diagonal[i]!]! += 0.2 * rnd()
    const b = Float64Array.from({ length: a.n }, () => rnd())
    const options = { relativeTolerance: 1e-10, maxIterations: 500 }
    const plain = conjugateGradients(new Float64Array(a.n), a, b, (out, r) => out.set(r), options)
    const x = new Float64Array(a.n)
    const result = conjugateGradients(x, a, b, (out, r) => ldlSolve(out, factor, r), options)
    expect(plain.converged && result.converged).toBe(true)
    // a nearby exact factor clusters the spectrum near 1 (Saad, ch. 9): far fewer iterations
    expect(result.iterations).toBeLessThan(plain.iterations / 2)
    const ax = csrMultiply(new Float64Array(a.n), a, x)
    for (let i = 0; i < a.n; i++) expect(ax[i]).toBeCloseTo(b[i]!, 8)
  })
})
