import { conjugateGradients } from "../linalg/conjugate-gradients";
import {
  ldlFactor,
  ldlSolve,
  ldlSymbolic,
  type LdlFactor,
  type LdlSymbolic,
} from "../linalg/ldl";
import { minimumDegreeOrdering } from "../linalg/minimum-degree";
import type { SymmetricCsr } from "../linalg/csr";
import type { TrianglePattern } from "../linalg/triangle-pattern";

/**
 * One SPD system on a fixed mesh pattern, shared by both solver paths: the ordering and symbolic
 * analysis are computed once per pattern; a numeric factor is kept and reused as a PCG
 * preconditioner for later matrices of the same pattern until PCG gets slow, then refactored.
 * The caller assembles pattern.matrix.values before each solve.
 */
export class SpdSystem<
  P extends { readonly matrix: SymmetricCsr } = TrianglePattern,
> {
  private symbolic: LdlSymbolic | undefined;
  private factor: LdlFactor | undefined;
  /** Counters for reports and benchmarks. */
  factorisations = 0;
  pcgIterations = 0;

  constructor(readonly pattern: P) {}

  get size(): number {
    return this.pattern.matrix.n;
  }

  /** Factor the current matrix now (throws NotPositiveDefiniteError). */
  refactor(): void {
    const a = this.pattern.matrix;
    this.symbolic ??= ldlSymbolic(a, minimumDegreeOrdering(a));
    this.factor = ldlFactor(a, this.symbolic, this.factor);
    this.factorisations++;
  }

  /** out = A⁻¹ b with a fresh factor of the current matrix. out, b: n Float64Array. */
  solveDirect(out: Float64Array, b: Readonly<Float64Array>): Float64Array {
    this.refactor();
    return ldlSolve(out, this.factor!, b);
  }

  /**
   * out ≈ A⁻¹ b to ‖b − A out‖ ≤ relativeTolerance·‖b‖: PCG with the kept factor when there is one
   * (at most maxPcgIterations), otherwise or on slow convergence a fresh factorisation.
   */
  solve(
    out: Float64Array,
    b: Readonly<Float64Array>,
    relativeTolerance: number,
    maxPcgIterations = 12,
  ): Float64Array {
    const factor = this.factor;
    if (!factor) return this.solveDirect(out, b);
    out.fill(0);
    const result = conjugateGradients(
      out,
      this.pattern.matrix,
      b,
      (z, r) => ldlSolve(z, factor, r),
      {
        relativeTolerance,
        maxIterations: maxPcgIterations,
      },
    );
    this.pcgIterations += result.iterations;
    if (result.converged) return out;
    return this.solveDirect(out, b);
  }
}
