/**
 * The exact second derivatives of the membrane energy (membrane-energy.ts) projected onto the
 * unknowns' directions: M = Bᵀ ∇²E B, B the #dofs unit directions (vertex normals; cable vertices
 * add the in-surface binormal). Membrane and cable unknowns land in one matrix.
 *
 * Area of a triangle, E_k = x_{k+1} − x_{k−1}, n = (x1−x0)×(x2−x0), P = I − n̂n̂ᵀ:
 *   b_a·∇²A b_b = P(b_a×E_k)·P(b_b×E_l) / (2|n|) + ½ s_kl n̂·(b_a×b_b),  s_kl = δ_{l,k+1} − δ_{l,k−1}
 * (derived from ∂A/∂x_k = ½ E_k × n̂; checked against finite differences in the tests).
 * Fibres: c γ_k γ_l (b_a·b_b − (b_a·ŵ)(b_b·ŵ)) / |w|. Cable segments: (T/l)(I − t̂t̂ᵀ) per end pair.
 */
import type { DofPattern } from '../linalg/dof-pattern'
import type { TrianglePattern } from '../linalg/triangle-pattern'
import type { MembraneStress } from './membrane-energy'
import { fibreVector } from './membrane-energy'
import type { CableLoad } from './membrane-fibres'

/** Where the unknowns live: see spatial-newton.ts. */
export interface ProjectedLayout {
  vertexPattern: TrianglePattern
  dofs: DofPattern
  /** #S×4 vertex-pattern slots of (i,i), (j,j), (i,j), (j,i) per cable segment, -1 where held. */
  segmentSlots: Int32Array
}

/** Writes Bᵀ∇²E B into layout.dofs.matrix.values. basis: #dofs×3; x: #V×3, m. */
export function assembleProjectedHessian(
  layout: ProjectedLayout,
  basis: Readonly<Float64Array>,
  x: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  stress: Readonly<MembraneStress>,
  cables: Readonly<CableLoad>,
): void {
  const { vertexPattern, dofs } = layout
  const { freeIndex, triangleSlots } = vertexPattern
  const { dofStart, slotOffset, matrix } = dofs
  const values = matrix.values
  values.fill(0)
  const sigma = stress.isotropic
  const fibres = stress.fibres
  // per corner: up to two unknowns, each with its direction, P(b×E_k) and the vertex's first row
  const dir = new Float64Array(18)
  const pc = new Float64Array(18)
  const count = new Int32Array(3)
  const first = new Int32Array(3)
  const n = new Float64Array(3)
  const e = new Float64Array(9)
  const w = new Float64Array(3)
  for (let t = 0; t < triangles.length; t += 3) {
    let any = false
    for (let k = 0; k < 3; k++) {
      const f = freeIndex[triangles[t + k]!]!
      count[k] = f >= 0 ? dofStart[f + 1]! - dofStart[f]! : 0
      first[k] = f >= 0 ? dofStart[f]! : -1
      if (f >= 0) any = true
    }
    if (!any) continue
    for (let k = 0; k < 3; k++) {
      const p = 3 * triangles[t + ((k + 1) % 3)]!,
        q = 3 * triangles[t + ((k + 2) % 3)]!
      for (let d = 0; d < 3; d++) e[3 * k + d] = x[p + d]! - x[q + d]!
    }
    // n = E_2 × (−E_1) = (x1 − x0) × (x2 − x0)
    n[0] = -(e[7]! * e[5]! - e[8]! * e[4]!)
    n[1] = -(e[8]! * e[3]! - e[6]! * e[5]!)
    n[2] = -(e[6]! * e[4]! - e[7]! * e[3]!)
    const twice = Math.hypot(n[0]!, n[1]!, n[2]!)
    if (twice === 0) continue
    for (let d = 0; d < 3; d++) n[d]! /= twice
    let fibreLength = 0
    if (fibres) fibreLength = fibreVector(fibres.weights, x, triangles, t, w)
    if (fibreLength > 0) for (let d = 0; d < 3; d++) w[d]! /= fibreLength
    for (let k = 0; k < 3; k++) {
      for (let a = 0; a < count[k]!; a++) {
        const o = 6 * k + 3 * a
        const row = first[k]! + a
        for (let d = 0; d < 3; d++) dir[o + d] = basis[3 * row + d]!
        // c = b × E_k, then P c
        const cx = dir[o + 1]! * e[3 * k + 2]! - dir[o + 2]! * e[3 * k + 1]!,
          cy = dir[o + 2]! * e[3 * k]! - dir[o]! * e[3 * k + 2]!,
          cz = dir[o]! * e[3 * k + 1]! - dir[o + 1]! * e[3 * k]!
        const along = cx * n[0]! + cy * n[1]! + cz * n[2]!
        pc[o] = cx - along * n[0]!
        pc[o + 1] = cy - along * n[1]!
        pc[o + 2] = cz - along * n[2]!
      }
    }
    const areaScale = sigma / twice // with the ½ below: σ/(2|n|)
    const slotBase = 3 * t
    for (let k = 0; k < 3; k++) {
      if (count[k] === 0) continue
      for (let l = 0; l < 3; l++) {
        if (count[l] === 0) continue
        const slot = triangleSlots[slotBase + 3 * k + l]!
        const s = l === (k + 1) % 3 ? 1 : l === (k + 2) % 3 ? -1 : 0
        const gg =
          fibreLength > 0 ? (fibres!.coefficient * fibres!.weights[t + k]! * fibres!.weights[t + l]!) / fibreLength : 0
        for (let a = 0; a < count[k]!; a++) {
          const oa = 6 * k + 3 * a
          const base = matrix.rowStart[first[k]! + a]! + slotOffset[slot]!
          for (let b = 0; b < count[l]!; b++) {
            const ob = 6 * l + 3 * b
            let h = 0.5 * areaScale * (pc[oa]! * pc[ob]! + pc[oa + 1]! * pc[ob + 1]! + pc[oa + 2]! * pc[ob + 2]!)
            if (s !== 0) {
              const bx = dir[oa + 1]! * dir[ob + 2]! - dir[oa + 2]! * dir[ob + 1]!,
                by = dir[oa + 2]! * dir[ob]! - dir[oa]! * dir[ob + 2]!,
                bz = dir[oa]! * dir[ob + 1]! - dir[oa + 1]! * dir[ob]!
              h += 0.5 * sigma * s * (n[0]! * bx + n[1]! * by + n[2]! * bz)
            }
            if (gg !== 0) {
              const ab = dir[oa]! * dir[ob]! + dir[oa + 1]! * dir[ob + 1]! + dir[oa + 2]! * dir[ob + 2]!
              const aw = dir[oa]! * w[0]! + dir[oa + 1]! * w[1]! + dir[oa + 2]! * w[2]!
              const bw = dir[ob]! * w[0]! + dir[ob + 1]! * w[1]! + dir[ob + 2]! * w[2]!
              h += gg * (ab - aw * bw)
            }
            values[base + b]! += h
          }
        }
      }
    }
  }
  addCableHessian(layout, basis, x, cables)
}

function addCableHessian(
  layout: Readonly<ProjectedLayout>,
  basis: Readonly<Float64Array>,
  x: Readonly<Float64Array>,
  cables: Readonly<CableLoad>,
): void {
  const { vertexPattern, dofs, segmentSlots } = layout
  const { freeIndex } = vertexPattern
  const { dofStart, slotOffset, matrix } = dofs
  const { segments, tensions } = cables
  const t = new Float64Array(3)
  for (let s = 0; s < tensions.length; s++) {
    const ends = [segments[2 * s]!, segments[2 * s + 1]!] as const
    for (let d = 0; d < 3; d++) t[d] = x[3 * ends[1] + d]! - x[3 * ends[0] + d]!
    const length = Math.hypot(t[0]!, t[1]!, t[2]!)
    if (length === 0) continue
    for (let d = 0; d < 3; d++) t[d]! /= length
    const q = tensions[s]! / length
    // (i,i), (j,j), (i,j), (j,i) with signs +, +, −, −
    for (let pair = 0; pair < 4; pair++) {
      const slot = segmentSlots[4 * s + pair]!
      if (slot < 0) continue
      const rowEnd = ends[pair === 1 || pair === 3 ? 1 : 0]
      const colEnd = ends[pair === 1 || pair === 2 ? 1 : 0]
      const fr = freeIndex[rowEnd]!,
        fc = freeIndex[colEnd]!
      const sign = pair < 2 ? q : -q
      for (let a = dofStart[fr]!; a < dofStart[fr + 1]!; a++) {
        const base = matrix.rowStart[a]! + slotOffset[slot]!
        const at = basis[3 * a]! * t[0]! + basis[3 * a + 1]! * t[1]! + basis[3 * a + 2]! * t[2]!
        for (let b = dofStart[fc]!; b < dofStart[fc + 1]!; b++) {
          const ab =
            basis[3 * a]! * basis[3 * b]! +
            basis[3 * a + 1]! * basis[3 * b + 1]! +
            basis[3 * a + 2]! * basis[3 * b + 2]!
          const bt = basis[3 * b]! * t[0]! + basis[3 * b + 1]! * t[1]! + basis[3 * b + 2]! * t[2]!
          matrix.values[base + b - dofStart[fc]!]! += sign * (ab - at * bt)
        }
      }
    }
  }
}
