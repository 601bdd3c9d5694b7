/**
 * The energy whose stationary points the second-order spatial solve seeks, and its gradient:
 *
 *   E(x) = σ_iso · Σ_T A_T(x)  +  c · Σ_T |Σ_k γ_Tk x_k|  +  Σ_s T_s · l_s(x)
 *
 * σ_iso · area is the isotropic part of the prestress (σ_iso = min(warp, fill), kN/m); the second
 * term is a continuum of fibres along the stronger direction carrying c = |warp − fill| kN per metre
 * of reference width (γ_Tk = A_ref·∇φ_k·â, â the direction on the reference triangle), so that on
 * the reference the stress is σ_iso·I + c·â⊗â, i.e. warp along the warp direction and fill across;
 * the last term is the edge cables (tension T, kN, over length l, m). warp = fill gives c = 0 and E is
 * σ × area: the minimal surface exactly. Small slopes over a plan reference: E ≈ const +
 * ½∫(σ_w u_w² + σ_f u_f²), whose Euler–Lagrange equation is σ_w u_ww + σ_f u_ff = 0 (the linear
 * membrane equation with orthotropic prestress). Units: x in m, E in kN·m.
 */
import type { CableLoad } from './membrane-fibres'
import type { WarpFibres } from './membrane-fibres'

/** The prestress as the energy sees it. */
export interface MembraneStress {
  /** σ_iso, kN/m. */
  isotropic: number
  /** Fibres along the stronger direction; absent when warp = fill. */
  fibres?: WarpFibres
}

/** E(x) in kN·m. x: #V×3 (m); triangles: #T×3. */
export function membraneEnergy(
  x: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  stress: Readonly<MembraneStress>,
  cables: Readonly<CableLoad>,
): number {
  let area = 0
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const ux = x[b]! - x[a]!,
      uy = x[b + 1]! - x[a + 1]!,
      uz = x[b + 2]! - x[a + 2]!
    const vx = x[c]! - x[a]!,
      vy = x[c + 1]! - x[a + 1]!,
      vz = x[c + 2]! - x[a + 2]!
    area += Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx)
  }
  let energy = (stress.isotropic * area) / 2
  const fibres = stress.fibres
  if (fibres) {
    let sum = 0
    for (let t = 0; t < triangles.length; t += 3) sum += fibreVector(fibres.weights, x, triangles, t, scratch)
    energy += fibres.coefficient * sum
  }
  const { segments, tensions } = cables
  for (let s = 0; s < tensions.length; s++) {
    const i = 3 * segments[2 * s]!,
      j = 3 * segments[2 * s + 1]!
    energy += tensions[s]! * Math.hypot(x[j]! - x[i]!, x[j + 1]! - x[i + 1]!, x[j + 2]! - x[i + 2]!)
  }
  return energy
}

const scratch = new Float64Array(3)

/** w = Σ_k γ_k x_k of triangle t (into out, 3), returns |w| (m²). weights: #T×3 γ (m). */
export function fibreVector(
  weights: Readonly<Float64Array>,
  x: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  t: number,
  out: Float64Array,
): number {
  out[0] = 0
  out[1] = 0
  out[2] = 0
  for (let k = 0; k < 3; k++) {
    const g = weights[t + k]!
    const p = 3 * triangles[t + k]!
    out[0]! += g * x[p]!
    out[1]! += g * x[p + 1]!
    out[2]! += g * x[p + 2]!
  }
  return Math.hypot(out[0]!, out[1]!, out[2]!)
}

/**
 * out = ∂E/∂x (#V×3, kN) for every vertex, held ones included; faceAreas (#T, m²) written on the way.
 * Area: ∂A/∂x_k = ½ E_k × n̂ with E_k = x_{k+1} − x_{k−1}; fibres: c γ_k ŵ; cables: T along the cable.
 */
export function membraneGradient(
  out: Float64Array,
  faceAreas: Float64Array,
  x: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  stress: Readonly<MembraneStress>,
  cables: Readonly<CableLoad>,
): Float64Array {
  out.fill(0)
  const sigma = stress.isotropic
  const corner = [0, 0, 0]
  for (let t = 0; t < triangles.length; t += 3) {
    corner[0] = 3 * triangles[t]!
    corner[1] = 3 * triangles[t + 1]!
    corner[2] = 3 * triangles[t + 2]!
    const [a, b, c] = corner as [number, number, number]
    const ux = x[b]! - x[a]!,
      uy = x[b + 1]! - x[a + 1]!,
      uz = x[b + 2]! - x[a + 2]!
    const vx = x[c]! - x[a]!,
      vy = x[c + 1]! - x[a + 1]!,
      vz = x[c + 2]! - x[a + 2]!
    const nx = uy * vz - uz * vy,
      ny = uz * vx - ux * vz,
      nz = ux * vy - uy * vx
    const twice = Math.hypot(nx, ny, nz)
    faceAreas[t / 3] = twice / 2
    if (twice === 0) continue
    const s = sigma / (2 * twice) // ½σ and the normalisation of n
    for (let k = 0; k < 3; k++) {
      const p = corner[(k + 1) % 3]!,
        q = corner[(k + 2) % 3]!,
        o = corner[k]!
      const ex = x[p]! - x[q]!,
        ey = x[p + 1]! - x[q + 1]!,
        ez = x[p + 2]! - x[q + 2]!
      out[o]! += s * (ey * nz - ez * ny)
      out[o + 1]! += s * (ez * nx - ex * nz)
      out[o + 2]! += s * (ex * ny - ey * nx)
    }
  }
  const fibres = stress.fibres
  if (fibres) {
    const w = new Float64Array(3)
    for (let t = 0; t < triangles.length; t += 3) {
      const length = fibreVector(fibres.weights, x, triangles, t, w)
      if (length === 0) continue
      const f = fibres.coefficient / length
      for (let k = 0; k < 3; k++) {
        const g = f * fibres.weights[t + k]!
        const o = 3 * triangles[t + k]!
        out[o]! += g * w[0]!
        out[o + 1]! += g * w[1]!
        out[o + 2]! += g * w[2]!
      }
    }
  }
  const { segments, tensions } = cables
  for (let s = 0; s < tensions.length; s++) {
    const i = 3 * segments[2 * s]!,
      j = 3 * segments[2 * s + 1]!
    const dx = x[j]! - x[i]!,
      dy = x[j + 1]! - x[i + 1]!,
      dz = x[j + 2]! - x[i + 2]!
    const length = Math.hypot(dx, dy, dz)
    if (length === 0) continue
    const f = tensions[s]! / length
    out[j]! += f * dx
    out[j + 1]! += f * dy
    out[j + 2]! += f * dz
    out[i]! -= f * dx
    out[i + 1]! -= f * dy
    out[i + 2]! -= f * dz
  }
  return out
}
