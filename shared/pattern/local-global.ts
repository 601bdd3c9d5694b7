/**
 * Refining the flat strip by local/global iterations on one factored edge system.
 * 1. As-rigid-as-possible (L. Liu, L. Zhang, Y. Xu, C. Gotsman, S. J. Gortler, "A local/global
 *    approach to mesh parameterization", SGP 2008): per triangle the best rotation of its 3D
 *    shape, then the cotan-weighted least-squares fit of all triangles.
 * 2. Strain energy with warp and fill (ours, in the same local/global form as mass-spring
 *    systems, T. Liu, A. W. Bargteil, J. F. O'Brien, L. Kavan, "Fast simulation of mass-spring
 *    systems", SIGGRAPH Asia 2013): Σ_e k(θ_e)·ε_e²·L_e over edges, ε_e = edge strain, θ_e the
 *    edge's angle to the warp on the surface, k(θ) = k_warp cos²θ + k_fill sin²θ; seam edges count
 *    SEAM_WEIGHT times so a seam keeps its 3D length on both sides (small mismatch).
 * Both energies are zero for an isometry, so a developable strip stays exact.
 */
import { factorEdgeSystem, solveEdgeSystem } from './edge-system'
import { PatternError } from './pattern-error'
import type { TriangleFrames } from './triangle-frames'

export const SEAM_WEIGHT = 100

export interface RefineOptions {
  arapIterations: number
  strainIterations: number
  signal?: { readonly aborted: boolean } | undefined
}

function checkCancelled(signal: RefineOptions['signal']): void {
  if (signal?.aborted) throw new PatternError('cancelled', 'a newer surface replaced this one', '(pattern)')
}

/** ARAP iterations on uv (#n×2, in place). held: a vertex kept in place. */
export function arapRefine(
  uv: Float64Array,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
  held: number,
  options: RefineOptions,
): void {
  const count = triangles.length / 3
  const weights = new Float64Array(3 * count)
  for (let i = 0; i < weights.length; i++) weights[i] = Math.max(frames.cotangents[i]!, 0) + 1e-8
  const system = factorEdgeSystem(uv.length / 2, triangles, weights, held)
  const targets = new Float64Array(6 * count)
  const x = frames.local
  for (let it = 0; it < options.arapIterations; it++) {
    checkCancelled(options.signal)
    for (let t = 0; t < count; t++) {
      // S = Σ w (flat edge)(local edge)ᵀ; its closest rotation has angle atan2(c − b, a + d)
      let a = 0,
        b = 0,
        c = 0,
        d = 0
      for (let k = 0; k < 3; k++) {
        const i = (k + 1) % 3,
          j = (k + 2) % 3
        const w = weights[3 * t + k]!
        const fu = uv[2 * triangles[3 * t + j]!]! - uv[2 * triangles[3 * t + i]!]!
        const fv = uv[2 * triangles[3 * t + j]! + 1]! - uv[2 * triangles[3 * t + i]! + 1]!
        const lx = x[6 * t + 2 * j]! - x[6 * t + 2 * i]!,
          ly = x[6 * t + 2 * j + 1]! - x[6 * t + 2 * i + 1]!
        a += w * fu * lx
        b += w * fu * ly
        c += w * fv * lx
        d += w * fv * ly
      }
      const angle = Math.atan2(c - b, a + d)
      const cs = Math.cos(angle),
        sn = Math.sin(angle)
      for (let k = 0; k < 3; k++) {
        const i = (k + 1) % 3,
          j = (k + 2) % 3
        const lx = x[6 * t + 2 * j]! - x[6 * t + 2 * i]!,
          ly = x[6 * t + 2 * j + 1]! - x[6 * t + 2 * i + 1]!
        targets[6 * t + 2 * k] = cs * lx - sn * ly
        targets[6 * t + 2 * k + 1] = sn * lx + cs * ly
      }
    }
    solveEdgeSystem(system, uv, triangles, weights, targets)
  }
}

/**
 * Strain-energy iterations on uv (#n×2, in place). edgeWeights: #t×3, k(θ)/L per triangle edge
 * (already shared between the two triangles of an inner edge and raised on seams).
 */
export function strainRefine(
  uv: Float64Array,
  triangles: Readonly<Uint32Array>,
  restLengths: Readonly<Float64Array>,
  edgeWeights: Readonly<Float64Array>,
  held: number,
  options: RefineOptions,
): void {
  const count = triangles.length / 3
  const system = factorEdgeSystem(uv.length / 2, triangles, edgeWeights, held)
  const targets = new Float64Array(6 * count)
  for (let it = 0; it < options.strainIterations; it++) {
    checkCancelled(options.signal)
    for (let t = 0; t < count; t++) {
      for (let k = 0; k < 3; k++) {
        const i = triangles[3 * t + ((k + 1) % 3)]!,
          j = triangles[3 * t + ((k + 2) % 3)]!
        const du = uv[2 * j]! - uv[2 * i]!,
          dv = uv[2 * j + 1]! - uv[2 * i + 1]!
        const len = Math.hypot(du, dv) || 1
        const rest = restLengths[3 * t + k]!
        targets[6 * t + 2 * k] = (rest * du) / len
        targets[6 * t + 2 * k + 1] = (rest * dv) / len
      }
    }
    solveEdgeSystem(system, uv, triangles, edgeWeights, targets)
  }
}
