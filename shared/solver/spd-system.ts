import { conjugateGradients } from '../linalg/conjugate-gradients'
import { ldlFactor, ldlSolve, ldlSymbolic, type LdlFactor, type LdlSymbolic } from '../linalg/ldl'
import { minimumDegreeOrdering } from '../linalg/minimum-degree'
import { nestedDissectionOrdering } from '../linalg/nested-dissection'
import type { SymmetricCsr } from '../linalg/csr'
import type { TrianglePattern } from '../linalg/triangle-pattern'

/**
 * One SPD system on a fixed mesh pattern, shared by both solver paths: the ordering and symbolic
 * analysis are computed once per pattern; a numeric factor is kept and reused as a PCG
 * preconditioner for later matrices of the same pattern until PCG gets slow, then refactored.
 * The caller assembles pattern.matrix.values before each solve.
 */
export class SpdSystem<P extends { readonly matrix: SymmetricCsr } = TrianglePattern> {
  private symbolic: LdlSymbolic | undefined
  private factor: LdlFactor | undefined
  /** Counters for reports and benchmarks. */
  factorisations = 0
  pcgIterations = 0

  /**
   * coordinates: optional n×3 Float64Array, a point per unknown (m): the ordering is then geometric
   * nested dissection (less fill on meshes), otherwise minimum degree.
   */
  constructor(
    readonly pattern: P,
    private readonly coordinates?: Float64Array,
  ) {}

  get size(): number {
    return this.pattern.matrix.n
  }

  /** Factor the current matrix now (throws NotPositiveDefiniteError). */
  refactor(): void {
    const a = this.pattern.matrix
    this.symbolic ??= ldlSymbolic(
      a,
      this.coordinates ? nestedDissectionOrdering(a, this.coordinates) : minimumDegreeOrdering(a),
    )
    this.factor = ldlFactor(a, this.symbolic, this.factor)
    this.factorisations++
  }

  /** out = A⁻¹ b with a fresh factor of the current matrix. out, b: n Float64Array. */
  solveDirect(out: Float64Array, b: Readonly<Float64Array>): Float64Array {
    this.refactor()
    return ldlSolve(out, this.factor!, b)
  }

  /**
   * out ≈ A⁻¹ b to ‖b − A out‖ ≤ relativeTolerance·‖b‖: PCG with the kept factor when there is one
   * (at most maxPcgIterations), otherwise or on slow convergence a fresh factorisation.
   */
  solve(out: Float64Array, b: Readonly<Float64Array>, relativeTolerance: number, maxPcgIterations = 12): Float64Array {
    const factor = this.factor
    if (!factor) return this.solveDirect(out, b)
    out.fill(0)
    const result = conjugateGradients(out, this.pattern.matrix, b, (z, r) => ldlSolve(z, factor, r), {
      relativeTolerance,
      maxIterations: maxPcgIterations,
    })
    this.pcgIterations += result.iterations
    if (result.converged) return out
    return this.solveDirect(out, b)
  }
}

/** n×3 coordinates of the rows of a reduced vertex pattern (freeIndex: #V → row or -1). */
export function rowCoordinates(
  vertices: Readonly<Float64Array>,
  freeIndex: Readonly<Int32Array>,
  rows: number,
): Float64Array {
  const out = new Float64Array(3 * rows)
  for (let v = 0; v < freeIndex.length; v++) {
    const r = freeIndex[v]!
    if (r >= 0) out.set(vertices.subarray(3 * v, 3 * v + 3), 3 * r)
  }
  return out
}
