import { csrMultiply, type SymmetricCsr } from './csr'

export interface PcgOptions {
  /** Stop when ‖b − A x‖₂ ≤ relativeTolerance · ‖b‖₂. */
  relativeTolerance: number
  maxIterations: number
}

export interface PcgResult {
  iterations: number
  /** Final ‖b − A x‖₂ / ‖b‖₂. */
  relativeResidual: number
  converged: boolean
}

/**
 * Preconditioned conjugate gradients for SPD A (Hestenes & Stiefel 1952; the textbook PCG of
 * Saad, "Iterative Methods for Sparse Linear Systems", alg. 9.1). x: n Float64Array, the start
 * guess on entry and the solution on return. precondition(out, r) applies M⁻¹ ≈ A⁻¹, e.g. an
 * LDLᵀ factor of an earlier matrix of the same pattern (see ldlSolve).
 */
export function conjugateGradients(
  x: Float64Array,
  a: Readonly<SymmetricCsr>,
  b: Readonly<Float64Array>,
  precondition: (out: Float64Array, r: Readonly<Float64Array>) => void,
  options: PcgOptions,
): PcgResult {
  const n = a.n
  const r = new Float64Array(n)
  const z = new Float64Array(n)
  const p = new Float64Array(n)
  const q = new Float64Array(n)
  csrMultiply(q, a, x)
  let bNorm = 0
  let rNorm = 0
  for (let i = 0; i < n; i++) {
    r[i] = b[i]! - q[i]!
    bNorm += b[i]! * b[i]!
    rNorm += r[i]! * r[i]!
  }
  bNorm = Math.sqrt(bNorm)
  if (bNorm === 0) {
    x.fill(0)
    return { iterations: 0, relativeResidual: 0, converged: true }
  }
  const goal = options.relativeTolerance * bNorm
  if (Math.sqrt(rNorm) <= goal)
    return {
      iterations: 0,
      relativeResidual: Math.sqrt(rNorm) / bNorm,
      converged: true,
    }
  precondition(z, r)
  p.set(z)
  let rz = dot(r, z)
  for (let it = 1; it <= options.maxIterations; it++) {
    csrMultiply(q, a, p)
    const pq = dot(p, q)
    if (!(pq > 0))
      return {
        iterations: it,
        relativeResidual: Math.sqrt(rNorm) / bNorm,
        converged: false,
      }
    const alpha = rz / pq
    rNorm = 0
    for (let i = 0; i < n; i++) {
      x[i]! += alpha * p[i]!
      r[i]! -= alpha * q[i]!
      rNorm += r[i]! * r[i]!
    }
    if (Math.sqrt(rNorm) <= goal)
      return {
        iterations: it,
        relativeResidual: Math.sqrt(rNorm) / bNorm,
        converged: true,
      }
    precondition(z, r)
    const rzNext = dot(r, z)
    const beta = rzNext / rz
    rz = rzNext
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!
  }
  return {
    iterations: options.maxIterations,
    relativeResidual: Math.sqrt(rNorm) / bNorm,
    converged: false,
  }
}

function dot(a: Readonly<Float64Array>, b: Readonly<Float64Array>): number {
  let s = 0
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!
  return s
}
