import type { SolverReason } from '../protocol/solver-reasons'
import type { SolverReport } from '../types'

/** How a caller steers and watches a solve. */
export interface SolveControl {
  /** Called after every iteration with the dimensionless residual. */
  onProgress?: (iteration: number, residual: number) => void
  /** Checked between iterations; when aborted the solve stops with reason 'cancelled'. */
  signal?: { readonly aborted: boolean }
  /** Converged when the dimensionless residual is at most this (default 1e-10). */
  tolerance?: number
  maxIterations?: number
}

/** Milliseconds since an arbitrary origin (performance.now exists in browsers, workers and Node). */
export function now(): number {
  return globalThis.performance.now()
}

/** A report with `ms` measured from `start`. */
export function report(
  method: string,
  start: number,
  iterations: number,
  residual: number,
  reason?: SolverReason,
): SolverReport {
  const converged = reason === undefined
  return {
    method,
    iterations,
    residual: Number.isFinite(residual) ? residual : Number.MAX_VALUE,
    converged,
    ...(converged ? {} : { reason }),
    ms: now() - start,
  }
}
