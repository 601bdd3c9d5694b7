/**
 * The global step shared by the as-rigid-as-possible and the strain-energy iterations: minimise
 * Σ w |(p_j − p_i) − target_ij|² over flat positions p, one vertex held (translation), solved as
 * two scalar systems with one LDLᵀ factor of the weighted edge Laplacian (factored once, reused).
 */
import {
  ldlFactor,
  ldlSolve,
  ldlSymbolic,
  minimumDegreeOrdering,
  trianglePattern,
  type LdlFactor,
  type TrianglePattern,
} from '../linalg'

export interface EdgeSystem {
  pattern: TrianglePattern
  factor: LdlFactor
  held: number
  rhsU: Float64Array
  rhsV: Float64Array
}

/**
 * triangles: #t×3 Uint32Array; weights: #t×3 Float64Array, entry 3t+k = weight of the edge
 * opposite corner k (from corner k+1 to corner k+2). held: the vertex kept where it is.
 * Throws NotPositiveDefiniteError when the weights do not hold the strip together.
 */
export function factorEdgeSystem(
  vertexCount: number,
  triangles: Readonly<Uint32Array>,
  weights: Readonly<Float64Array>,
  held: number,
): EdgeSystem {
  const isFixed = new Uint8Array(vertexCount)
  isFixed[held] = 1
  const pattern = trianglePattern(vertexCount, triangles, isFixed)
  const values = pattern.matrix.values
  for (let t = 0; t < triangles.length / 3; t++) {
    for (let k = 0; k < 3; k++) {
      const a = (k + 1) % 3,
        b = (k + 2) % 3
      const w = weights[3 * t + k]!
      const slots = pattern.triangleSlots
      add(values, slots[9 * t + 3 * a + a]!, w)
      add(values, slots[9 * t + 3 * b + b]!, w)
      add(values, slots[9 * t + 3 * a + b]!, -w)
      add(values, slots[9 * t + 3 * b + a]!, -w)
    }
  }
  const symbolic = ldlSymbolic(pattern.matrix, minimumDegreeOrdering(pattern.matrix))
  const n = pattern.matrix.n
  return {
    pattern,
    factor: ldlFactor(pattern.matrix, symbolic),
    held,
    rhsU: new Float64Array(n),
    rhsV: new Float64Array(n),
  }
}

function add(values: Float64Array, slot: number, w: number): void {
  if (slot >= 0) values[slot]! += w
}

/**
 * Solves for flat positions uv (#n×2, updated in place; the held vertex keeps its place).
 * targets: #t×6 Float64Array, entry 6t+2k..+1 = the wanted vector of edge k (corner k+1 → k+2).
 */
export function solveEdgeSystem(
  system: EdgeSystem,
  uv: Float64Array,
  triangles: Readonly<Uint32Array>,
  weights: Readonly<Float64Array>,
  targets: Readonly<Float64Array>,
): void {
  const { pattern, rhsU, rhsV, held } = system
  const free = pattern.freeIndex
  rhsU.fill(0)
  rhsV.fill(0)
  const hu = uv[2 * held]!,
    hv = uv[2 * held + 1]!
  for (let t = 0; t < triangles.length / 3; t++) {
    for (let k = 0; k < 3; k++) {
      const i = triangles[3 * t + ((k + 1) % 3)]!,
        j = triangles[3 * t + ((k + 2) % 3)]!
      const w = weights[3 * t + k]!
      const tu = w * targets[6 * t + 2 * k]!,
        tv = w * targets[6 * t + 2 * k + 1]!
      // ∂/∂p_j of w|p_j − p_i − τ|² = 0 gives +wτ on row j and −wτ on row i; the held vertex moves to the rhs
      const fi = free[i]!,
        fj = free[j]!
      if (fj >= 0) {
        rhsU[fj]! += tu
        rhsV[fj]! += tv
        if (fi < 0) {
          rhsU[fj]! += w * hu
          rhsV[fj]! += w * hv
        }
      }
      if (fi >= 0) {
        rhsU[fi]! -= tu
        rhsV[fi]! -= tv
        if (fj < 0) {
          rhsU[fi]! += w * hu
          rhsV[fi]! += w * hv
        }
      }
    }
  }
  ldlSolve(rhsU, system.factor, rhsU)
  ldlSolve(rhsV, system.factor, rhsV)
  for (let v = 0; v < free.length; v++) {
    const f = free[v]!
    if (f < 0) continue
    uv[2 * v] = rhsU[f]!
    uv[2 * v + 1] = rhsV[f]!
  }
}
